using System.Globalization;
using Microsoft.AspNetCore.Http.HttpResults;
using Partwise.Api.Credentials;
using Partwise.Api.Infrastructure;
using Partwise.Core.Problems;
using Partwise.Core.Screening;
using Partwise.Core.Tables;
using Partwise.Core.Zeros;
using Partwise.Storage.Flags;
using Serilog;

namespace Partwise.Api.Baselines;

/// <summary>The biplot of a stored baseline: its principal axes in clr form, with flagged samples placed on them.</summary>
public static class BiplotEndpoints
{
    /// <summary>The most flags placed in one request.</summary>
    public const int MaxFlags = 100;

    /// <summary>Maps <c>GET /v1/baselines/{id}/biplot</c> on the baselines' group.</summary>
    public static RouteHandlerBuilder MapBiplot(this RouteGroupBuilder group)
    {
        ArgumentNullException.ThrowIfNull(group);
        return group.MapGet("/{id}/biplot", Get)
            .RequireRole(Roles.Reader)
            .WithName("GetBaselineBiplot")
            .WithSummary("The baseline's biplot, with flagged samples placed on it")
            .WithDescription(
                "The eigen-decomposition of the baseline's scatter in clr form, S_clr = Σ λ_k v_k v_kᵀ (the clr " +
                "principal components, Aitchison 1983; the compositional biplot, Aitchison & Greenacre 2002): the " +
                "`variances` λ_k of all p axes, the fraction of the total `explained` by the two shown, every part's " +
                "standard coordinates v_jk on them (`partCoordinates`, the arrow tips of a form biplot), and the " +
                "reference `ellipse` s₁²/λ₁ + s₂²/λ₂ = threshold, the shadow of the threshold ellipsoid on the plane: " +
                "a sample outside it is beyond the threshold, one inside may still be beyond it along other axes. " +
                "`flags` (comma-separated flag ids of this baseline, at most 100) places each flagged sample at its " +
                "scores (c − μ_clr)ᵀ v_k, from the values kept with the flag after the baseline's zero policy; a flag " +
                "raised before values were kept has null scores. An unknown baseline is a 404 " +
                "`/problems/not-found`; so is an unknown flag or one of another baseline, pointing at `/flags/k`; an " +
                "empty or repeated flag id is a 400 `/problems/invalid-input` at `/flags/k`, more than 100 a 400 at `/flags`." + BaselineEndpoints.Caution)
            .ProducesProblem(StatusCodes.Status400BadRequest)
            .ProducesProblem(StatusCodes.Status404NotFound);
    }

    /// <summary>The biplot of one baseline.</summary>
    /// <param name="id">The baseline's id.</param>
    /// <param name="flags">Comma-separated flag ids of this baseline to place (at most 100).</param>
    /// <param name="store">The store.</param>
    /// <param name="cache">Rebuilt baselines.</param>
    /// <param name="log">The request's completion event.</param>
    /// <param name="cancellationToken">The request's cancellation.</param>
    public static async Task<Results<Ok<BiplotResponse>, ProblemHttpResult>> Get(
        string id,
        string? flags,
        StoreAccess store,
        BaselineCache cache,
        IDiagnosticContext log,
        CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        ArgumentNullException.ThrowIfNull(cache);
        ArgumentNullException.ThrowIfNull(log);
        string[] flagIds;
        try
        {
            // A repeated parameter (flags=a&flags=b) arrives joined with commas.
            flagIds = ReadFlagIds(flags?.Split(',', StringSplitOptions.TrimEntries));
        }
        catch (CompositionException e)
        {
            return ProblemCatalog.ToResult(e);
        }

        var storage = await store.ReadyAsync(cancellationToken).ConfigureAwait(false);
        var baseline = cache.Find(id);
        if (baseline is null)
        {
            var record = await storage.Baselines.GetAsync(id, cancellationToken).ConfigureAwait(false);
            if (record is null)
            {
                return BaselineEndpoints.NotFound(id);
            }

            baseline = cache.Add(record);
        }

        var biplot = BaselineBiplot.Create(baseline.Baseline);
        var samples = new List<BiplotSample>(flagIds.Length);
        for (var k = 0; k < flagIds.Length; k++)
        {
            var pointer = string.Create(CultureInfo.InvariantCulture, $"/flags/{k}");
            var flag = await storage.Flags.GetAsync(flagIds[k], cancellationToken).ConfigureAwait(false);
            if (flag is null)
            {
                return ProblemCatalog.ToResult(new CompositionException(ProblemTypes.NotFound, pointer, $"There is no flag with id '{flagIds[k]}'."));
            }

            if (!string.Equals(flag.BaselineId, id, StringComparison.Ordinal))
            {
                return ProblemCatalog.ToResult(new CompositionException(ProblemTypes.NotFound, pointer, $"This baseline has no flag '{flagIds[k]}': it was raised against the baseline '{flag.BaselineId}'."));
            }

            samples.Add(Place(biplot, baseline, flag));
        }

        log.Set("BaselineId", id);
        log.Set("FlagCount", samples.Count);
        var b = baseline.Baseline;
        return TypedResults.Ok(new BiplotResponse(
            id,
            b.Parts,
            biplot.Dimensions,
            biplot.Variances,
            biplot.TotalVariance,
            biplot.Explained,
            biplot.PartCoordinates,
            new BiplotEllipse(b.Cutoff, biplot.Threshold, biplot.EllipseSemiAxes),
            samples));
    }

    /// <summary>Checks the flag ids: none is empty or repeated, at most <see cref="MaxFlags"/>; problems point at <c>/flags/k</c>.</summary>
    /// <exception cref="CompositionException">400 for a bad list.</exception>
    public static string[] ReadFlagIds(string[]? ids)
    {
        if (ids is null)
        {
            return [];
        }

        if (ids.Length > MaxFlags)
        {
            throw new CompositionException(ProblemTypes.InvalidInput, "/flags", string.Create(CultureInfo.InvariantCulture, $"At most {MaxFlags} flags are placed in one request, not {ids.Length}."));
        }

        var seen = new HashSet<string>(StringComparer.Ordinal);
        for (var k = 0; k < ids.Length; k++)
        {
            var pointer = string.Create(CultureInfo.InvariantCulture, $"/flags/{k}");
            if (ids[k].Length == 0)
            {
                throw new CompositionException(ProblemTypes.InvalidInput, pointer, "A flag id is empty: separate the ids with single commas.");
            }

            if (!seen.Add(ids[k]))
            {
                throw new CompositionException(ProblemTypes.InvalidInput, pointer, $"The flag id '{ids[k]}' is repeated.");
            }
        }

        return ids;
    }

    private static BiplotSample Place(BaselineBiplot biplot, ScreeningBaseline baseline, FlagRecord flag)
    {
        var status = FlagStatusNames.ToName(flag.Status);
        if (flag.ValuesJson is null)
        {
            return new BiplotSample(flag.Id, flag.SampleId, status, null, null, null);
        }

        // The values were checked when the sample was screened against this (immutable) baseline; the same zero
        // policy gives the same positive composition now.
        var values = BaselineJson.Read<Dictionary<string, double>>(flag.ValuesJson);
        var parts = baseline.Baseline.Parts;
        var row = new double[parts.Count];
        for (var j = 0; j < row.Length; j++)
        {
            row[j] = values[parts[j]];
        }

        var replaced = ZeroReplacement.Apply(CompositionTable.FromValues(parts, row), baseline.Zeros).Table.Values;
        var placed = biplot.Place(replaced);
        return new BiplotSample(flag.Id, flag.SampleId, status, [.. placed.Scores.Take(biplot.Dimensions)], placed.PlaneSquaredDistance, placed.SquaredDistance);
    }
}
