using System.Globalization;
using Partwise.Api.Infrastructure;
using Partwise.Api.Infrastructure.Metrics;
using Partwise.Api.Shapes;
using Partwise.Core.Problems;
using Partwise.Core.Ratios;
using Partwise.Core.Screening;
using Partwise.Core.Selection;
using Partwise.Core.Tables;
using Partwise.Core.Transforms;
using Partwise.Core.Variance;
using Partwise.Core.Zeros;

namespace Partwise.Api.Baselines;

/// <summary>A fitted baseline and its document, waiting for the store's id, version and time.</summary>
/// <param name="Name">The name to store it under.</param>
/// <param name="Fitted">The math library's baseline and what the fit saw.</param>
/// <param name="Document">The document without id, version and creation time.</param>
/// <param name="Table">The reference table as received (for the log's shape fields).</param>
public sealed record PendingBaseline(string Name, FittedBaseline Fitted, BaselineDocument Document, CompositionTable Table)
{
    /// <summary>The document with the store's stamp.</summary>
    public BaselineDocument Stamp(string id, int version, DateTimeOffset createdAt) =>
        Document with { Id = id, Version = version, CreatedAt = createdAt };
}

/// <summary>Fits a baseline to the reference samples of a <see cref="BaselineRequest"/>.</summary>
public static class BaselineFitting
{
    /// <summary>The longest baseline name.</summary>
    public const int MaxNameLength = 200;

    /// <summary>The longest description.</summary>
    public const int MaxDescriptionLength = 2_000;

    /// <summary>
    /// Applies the zero policy, computes the coordinates y = (ln x) A of every reference sample (A the pivot ilr
    /// basis or the log-contrasts of the ratios), estimates location and scatter (robust: reweighted FAST-MCD,
    /// Rousseeuw &amp; Van Driessen 1999; classical: mean and covariance), and builds the document.
    /// </summary>
    /// <exception cref="CompositionException">400 for shapes and names, 422 for what cannot be fitted (too few samples, a singular scatter, bad rules or cutoff).</exception>
    /// <param name="request">The reference samples and options.</param>
    /// <param name="cancellationToken">Stops the ratio selection, the coordinates' row loop and the FAST-MCD search.</param>
    public static PendingBaseline Fit(BaselineRequest request, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        var name = RequireName(request.Name);
        if (request.Description is { Length: > MaxDescriptionLength })
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/description", string.Create(CultureInfo.InvariantCulture, $"The description has {request.Description.Length} characters; at most {MaxDescriptionLength} are kept."));
        }

        var table = request.ToTable();
        var parts = table.Parts;
        var scatter = BaselineOptionsReader.Scatter(request.Scatter, "/scatter");
        var cutoff = request.Cutoff ?? Baseline.DefaultCutoff;
        var rules = BaselineOptionsReader.Rules(request.Rules, parts, "/rules");
        var amalgamations = BaselineOptionsReader.Amalgamations(request.Amalgamations, parts, "/amalgamations");
        var zeros = ZeroReplacement.Apply(table, ZerosOption.ToPolicy(request.Zeros));
        var reference = zeros.Table;
        var (type, map, ratios, basis, explained) = Coordinates(request.Coordinates, reference, cancellationToken);
        var p = map.Length / parts.Count;
        // The reference samples' coordinates y = (ln x) A, by the math library's own transforms.
        var coordinates = basis is not null ? Ilr.Forward(reference, basis, cancellationToken).Values : RatioSetTransform.Forward(reference, ratios!, cancellationToken).Values;
        var named = NamedRatios(amalgamations, parts);

        FittedBaseline fitted;
        try
        {
            fitted = BaselineFit.Fit(parts, map, coordinates, new BaselineOptions { Scatter = scatter, Cutoff = cutoff, NamedRatios = named, Rules = rules }, reference, cancellationToken);
        }
        catch (CompositionException e)
        {
            // The fit speaks of a baseline document; here the coordinates come from the request's options and the scatter from its rows.
            throw BaselineOptionsReader.Rebase(e, pointer => pointer switch
            {
                "/ratios" => "/coordinates/ratios",
                "/location" or "/covariance" => "/rows",
                _ when pointer.StartsWith("/namedRatios", StringComparison.Ordinal) => "/amalgamations",
                _ => pointer,
            });
        }

        var baseline = fitted.Baseline;
        var document = new BaselineDocument
        {
            Name = name,
            Description = request.Description,
            Parts = parts,
            Zeros = request.Zeros ?? new ZerosOption { Method = "reject" },
            Coordinates = new BaselineCoordinatesOption { Type = type },
            Ratios = ratios?.Select(r => BaselineOptionsReader.ToOption(r, parts)).ToArray(),
            Basis = basis is null ? null : new RowMajor(basis.Coefficients, basis.Dimension),
            Location = [.. baseline.Location],
            Covariance = new RowMajor([.. baseline.Covariance], p),
            Scatter = BaselineOptionsReader.ScatterName(scatter),
            Cutoff = baseline.Cutoff,
            Threshold = baseline.Threshold,
            DegreesOfFreedom = baseline.DegreesOfFreedom,
            ReferenceCount = fitted.ReferenceCount,
            ReferenceFlagged = fitted.ReferenceFlagged,
            Explained = explained,
            Rules = BaselineOptionsReader.RuleItems(baseline.Rules, parts),
            Amalgamations = request.Amalgamations is null ? null : amalgamations.ToDictionary(a => a.Key, a => (IReadOnlyList<string>)[.. a.Value.Select(j => parts[j])], StringComparer.Ordinal),
            NamedRatios = [.. baseline.NamedRatios.Select((r, k) => new NamedRatioItem(r.Ratio.Label, NamedPairs(amalgamations)[k].Num, NamedPairs(amalgamations)[k].Den, r.Location, r.Scale))],
        };
        return new PendingBaseline(name, fitted, document, table);
    }

    /// <summary>The ordered pairs of disjoint named amalgamations (first before second in the given order): the named ratios.</summary>
    public static List<(string Num, string Den)> NamedPairs(IReadOnlyDictionary<string, int[]> amalgamations)
    {
        ArgumentNullException.ThrowIfNull(amalgamations);
        var names = amalgamations.Keys.ToArray();
        var pairs = new List<(string, string)>();
        for (var a = 0; a < names.Length; a++)
        {
            for (var b = a + 1; b < names.Length; b++)
            {
                if (!amalgamations[names[a]].Intersect(amalgamations[names[b]]).Any())
                {
                    pairs.Add((names[a], names[b]));
                }
            }
        }

        return pairs;
    }

    private static LogRatio[] NamedRatios(Dictionary<string, int[]> amalgamations, IReadOnlyList<string> parts) =>
        [.. NamedPairs(amalgamations).Select(pair => BaselineOptionsReader.NamedRatio(parts, pair.Num, amalgamations[pair.Num], pair.Den, amalgamations[pair.Den], "/amalgamations"))];

    private static string RequireName(string? name)
    {
        if (string.IsNullOrWhiteSpace(name))
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/name", "The baseline needs \"name\": a non-empty name (a refit under the same name gets the next version).");
        }

        return name.Length <= MaxNameLength
            ? name
            : throw new CompositionException(ProblemTypes.InvalidInput, "/name", string.Create(CultureInfo.InvariantCulture, $"The name has {name.Length} characters; at most {MaxNameLength}."));
    }

    private static (string Type, double[] Map, LogRatio[]? Ratios, IlrBasis? Basis, double? Explained) Coordinates(BaselineCoordinatesOption? option, CompositionTable reference, CancellationToken cancellationToken)
    {
        var parts = reference.Parts;
        switch (option?.Type ?? (option is null ? "ilr" : null))
        {
            case "ilr":
                var basis = PivotBasis.Create(parts);
                return ("ilr", basis.Coefficients, null, basis, null);
            case "ratios":
                if (option!.Ratios is not { Count: > 0 } list)
                {
                    throw new CompositionException(ProblemTypes.InvalidInput, "/coordinates/ratios", "Ratio coordinates need \"ratios\": one or more pairwise or balance ratios.");
                }

                if (list.Count > parts.Count - 1)
                {
                    throw new CompositionException(ProblemTypes.SingularRatioSet, "/coordinates/ratios", string.Create(CultureInfo.InvariantCulture, $"{list.Count} ratios over {parts.Count} parts cannot be independent: at most {parts.Count - 1}."));
                }

                var ratios = list.Select((r, k) => BaselineOptionsReader.CoordinateRatio(r, parts, string.Create(CultureInfo.InvariantCulture, $"/coordinates/ratios/{k}"))).ToArray();
                var map = RatioMap(ratios, parts.Count);
                RequireIndependent(parts, map, ratios.Length);
                return ("ratios", map, ratios, null, null);
            case "selection":
                var (selected, explained) = Select(option!, reference, cancellationToken);
                return ("selection", RatioMap(selected, parts.Count), selected, null, explained);
            case null:
                throw new CompositionException(ProblemTypes.InvalidInput, "/coordinates/type", "The coordinates need \"type\": ilr, ratios or selection.");
            default:
                throw new CompositionException(ProblemTypes.InvalidInput, "/coordinates/type", $"The coordinates type '{option!.Type}' is unknown; use ilr, ratios or selection.");
        }
    }

    /// <summary>
    /// Stepwise selection of pairwise log-ratios on the reference samples (Greenacre 2019, Math. Geosci. 51:649-682),
    /// with equal part weights: the chosen ratios become the coordinates and the last step's cumulative fraction is
    /// <c>explained</c>. Only pairwise candidates enter, since an amalgamation ratio is not linear in the logs and so
    /// cannot be a coordinate; named amalgamations serve as reasons (the request's <c>amalgamations</c>).
    /// </summary>
    private static (LogRatio[] Ratios, double Explained) Select(BaselineCoordinatesOption option, CompositionTable reference, CancellationToken cancellationToken)
    {
        if (option.Amalgamations is { Count: > 0 })
        {
            throw new CompositionException(
                ProblemTypes.InvalidOption,
                "/coordinates/amalgamations",
                "A selection baseline chooses pairwise ratios only: an amalgamation ratio is not linear in the logs and cannot be a coordinate. Give named amalgamations as the request's top-level \"amalgamations\"; their ratios then serve as reasons.");
        }

        RatioSelectionResult result;
        try
        {
            var weights = PartWeights.Resolve(PartWeightSpec.Equal, reference);
            result = PartwiseMetrics.TimeSelection("baseline", () => RatioSelection.Run(reference, weights, new RatioSelectionOptions { MaxRatios = option.MaxRatios, Explained = option.Explained }, cancellationToken));
        }
        catch (CompositionException e)
        {
            throw BaselineOptionsReader.Rebase(e, pointer => pointer switch
            {
                "/stop/maxRatios" => "/coordinates/maxRatios",
                "/stop/explained" => "/coordinates/explained",
                _ => pointer,
            });
        }

        if (result.Steps.Count == 0)
        {
            throw new CompositionException(ProblemTypes.InvalidOption, "/coordinates", "The selection chose no ratio, so the baseline would have no coordinates.");
        }

        return ([.. result.Steps.Select(s => s.Ratio)], result.Steps[^1].Explained);
    }

    /// <summary>
    /// Refuses linearly dependent coordinate ratios before any scatter is estimated, so that the problem names the
    /// ratios rather than the (then necessarily singular) scatter: the math library's check of the map, run with a
    /// unit scatter.
    /// </summary>
    private static void RequireIndependent(IReadOnlyList<string> parts, double[] map, int p)
    {
        var identity = new double[p * p];
        for (var k = 0; k < p; k++)
        {
            identity[(k * p) + k] = 1;
        }

        try
        {
            Baseline.Create(parts, map, new double[p], identity, ScatterMethod.Classical);
        }
        catch (CompositionException e)
        {
            throw BaselineOptionsReader.Rebase(e, pointer => pointer == "/ratios" ? "/coordinates/ratios" : pointer);
        }
    }

    /// <summary>The J × p map whose columns are the ratios' log-contrasts.</summary>
    public static double[] RatioMap(IReadOnlyList<LogRatio> ratios, int partCount)
    {
        ArgumentNullException.ThrowIfNull(ratios);
        var p = ratios.Count;
        var map = new double[partCount * p];
        for (var c = 0; c < p; c++)
        {
            var a = ratios[c].LogContrast(partCount)!;
            for (var k = 0; k < partCount; k++)
            {
                map[(k * p) + c] = a[k];
            }
        }

        return map;
    }
}
