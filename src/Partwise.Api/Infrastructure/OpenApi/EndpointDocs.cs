namespace Partwise.Api.Infrastructure.OpenApi;

/// <summary>A query parameter that carries a simple option of a <c>text/csv</c> request.</summary>
/// <param name="Name">The parameter name, for example <c>zeros</c>.</param>
/// <param name="Description">What it sets and its JSON equivalent.</param>
/// <param name="Values">The allowed values, when it is a choice; null for a free value.</param>
/// <param name="IsNumber">True when the value is a number.</param>
public sealed record CsvQueryParameter(string Name, string Description, IReadOnlyList<string>? Values = null, bool IsNumber = false);

/// <summary>Endpoint metadata: the endpoint also takes <c>text/csv</c>, with these query options and this example.</summary>
/// <param name="Description">What the CSV body holds.</param>
/// <param name="Example">An example CSV body.</param>
/// <param name="Query">The query parameters that carry options.</param>
public sealed record CsvRequestMetadata(string Description, string Example, IReadOnlyList<CsvQueryParameter> Query);

/// <summary>Endpoint metadata: the JSON request body's type and an example, for the OpenAPI document.</summary>
/// <param name="RequestType">The request record.</param>
/// <param name="Example">The example, as JSON text.</param>
/// <remarks>
/// Kept apart from the framework's accepts metadata on purpose: that metadata makes routing refuse other media
/// types with its own 415 before the body binder can answer with this service's problem document.
/// </remarks>
public sealed record JsonRequestMetadata(Type RequestType, string Example);

/// <summary>The query parameters shared by table endpoints in <c>text/csv</c>.</summary>
public static class CsvQuery
{
    /// <summary><c>zeros</c>: the zero method.</summary>
    public static CsvQueryParameter Zeros { get; } = new("zeros", "The zero method (JSON `zeros.method`); default `reject`.", ["reject", "multiplicative", "bayesian-multiplicative"]);

    /// <summary><c>detectionLimit</c>: one detection limit for all parts.</summary>
    public static CsvQueryParameter DetectionLimit { get; } = new("detectionLimit", "For `multiplicative`: one detection limit for every part, in the table's units (JSON `zeros.detectionLimits` as a number). A limit per part is given as `detectionLimit.NO3=0.05`.", IsNumber: true);

    /// <summary><c>fraction</c>.</summary>
    public static CsvQueryParameter Fraction { get; } = new("fraction", "For `multiplicative`: a zero becomes fraction × limit, in (0, 1]; default 0.65 (JSON `zeros.fraction`).", IsNumber: true);

    /// <summary><c>prior</c>.</summary>
    public static CsvQueryParameter Prior { get; } = new("prior", "For `bayesian-multiplicative` (integer rows only): the Dirichlet prior (JSON `zeros.prior`).", ["bayes-laplace", "jeffreys", "perks", "square-root"]);

    /// <summary>The zero policy parameters.</summary>
    public static IReadOnlyList<CsvQueryParameter> ZeroPolicy { get; } = [Zeros, DetectionLimit, Fraction, Prior];
}

/// <summary>Route builder helpers that attach the documentation metadata.</summary>
public static class EndpointDocsExtensions
{
    /// <summary>
    /// Declares the JSON body (schema <typeparamref name="TRequest"/>, with an example) and the CSV alternative
    /// (with its query options and an example).
    /// </summary>
    public static RouteHandlerBuilder AcceptsTable<TRequest>(this RouteHandlerBuilder builder, string jsonExample, CsvRequestMetadata csv)
        where TRequest : notnull
    {
        ArgumentNullException.ThrowIfNull(builder);
        return builder.WithMetadata(new JsonRequestMetadata(typeof(TRequest), jsonExample), csv);
    }

    /// <summary>Declares every problem response a table endpoint can give: 400, 413, 415 and 422.</summary>
    public static TBuilder ProducesTableProblems<TBuilder>(this TBuilder builder)
        where TBuilder : IEndpointConventionBuilder =>
        builder
            .ProducesProblem(StatusCodes.Status400BadRequest)
            .ProducesProblem(StatusCodes.Status413PayloadTooLarge)
            .ProducesProblem(StatusCodes.Status415UnsupportedMediaType)
            .ProducesProblem(StatusCodes.Status422UnprocessableEntity);
}
