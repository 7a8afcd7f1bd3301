namespace Partwise.Core.Problems;

/// <summary>
/// The stable problem types of the contract. Callers branch on these strings, so they never change once
/// published. The host maps each to an HTTP status: shape errors to 400, uncomputable input to 422.
/// </summary>
public static class ProblemTypes
{
    /// <summary>Malformed or wrongly shaped input: ragged rows, duplicate or empty part names, a single part, wrong types.</summary>
    public const string InvalidInput = "/problems/invalid-input";

    /// <summary>A value that is NaN, infinite or otherwise not a finite number.</summary>
    public const string NonFiniteValue = "/problems/non-finite-value";

    /// <summary>A negative value in a composition.</summary>
    public const string NegativeValue = "/problems/negative-value";

    /// <summary>A zero under the <c>reject</c> policy, or a row that is entirely zero.</summary>
    public const string ZeroValue = "/problems/zero-value";

    /// <summary>A part name that the table does not have.</summary>
    public const string UnknownPart = "/problems/unknown-part";

    /// <summary>A zero policy that cannot be applied (missing detection limit, non-integer counts for the Bayesian policy).</summary>
    public const string InvalidZeroPolicy = "/problems/invalid-zero-policy";

    /// <summary>A partition that is not a sequential binary partition.</summary>
    public const string InvalidPartition = "/problems/invalid-partition";

    /// <summary>A ratio that is not well formed: overlapping sides, an empty side, a missing or wrong <c>kind</c>.</summary>
    public const string InvalidRatio = "/problems/invalid-ratio";

    /// <summary>A ratio set that cannot be inverted: incomplete, singular or ill-conditioned.</summary>
    public const string SingularRatioSet = "/problems/singular-ratio-set";

    /// <summary>Ratio values whose back-transform gives a part that is zero or negative.</summary>
    public const string InfeasibleRatioValues = "/problems/infeasible-ratio-values";

    /// <summary>Input within the size limit of the body but over a computation limit (rows, parts, distance matrix).</summary>
    public const string ComputationLimit = "/problems/computation-limit";

    /// <summary>Weights that are not positive or name unknown parts.</summary>
    public const string InvalidWeights = "/problems/invalid-weights";

    /// <summary>A covariance (moments) that is not symmetric positive semi-definite, or whose names do not match.</summary>
    public const string InvalidMoments = "/problems/invalid-moments";

    /// <summary>An option outside its valid range (for example <c>stop.explained</c> outside (0, 1]).</summary>
    public const string InvalidOption = "/problems/invalid-option";

    /// <summary>A scatter matrix that is singular, so no distance can be computed.</summary>
    public const string SingularScatter = "/problems/singular-scatter";

    /// <summary>A request over a size limit: the body's bytes, or its number of parts or rows (HTTP 413).</summary>
    public const string TooLarge = "/problems/too-large";

    /// <summary>A request body in a media type the endpoint does not take (HTTP 415).</summary>
    public const string UnsupportedMediaType = "/problems/unsupported-media-type";

    /// <summary>No resource at the requested path (HTTP 404).</summary>
    public const string NotFound = "/problems/not-found";

    /// <summary>The resource exists but not with the requested HTTP method (HTTP 405).</summary>
    public const string MethodNotAllowed = "/problems/method-not-allowed";

    /// <summary>No key, a key the service does not know, or (with no key configured) a caller not on loopback (HTTP 401).</summary>
    public const string Unauthorized = "/problems/unauthorized";

    /// <summary>A known key without the role the route needs (HTTP 403).</summary>
    public const string Forbidden = "/problems/forbidden";

    /// <summary>A failure inside the service, not caused by the request (HTTP 500).</summary>
    public const string InternalError = "/problems/internal-error";

    /// <summary>Fewer reference samples than a scatter estimate needs (at least p + 1 for p coordinates).</summary>
    public const string TooFewSamples = "/problems/too-few-samples";

    /// <summary>A sample that lacks a value for one of the baseline's parts.</summary>
    public const string MissingPart = "/problems/missing-part";

    /// <summary>A forced ratio that adds nothing: on the data it is a combination of the ratios before it (it closes a cycle or repeats one).</summary>
    public const string DependentRatio = "/problems/dependent-ratio";

    /// <summary>A ratio set whose back-transform is not a linear system: balances together with amalgamation ratios.</summary>
    public const string UnsupportedRatioSet = "/problems/unsupported-ratio-set";

    /// <summary>Data without log-ratio variance (all compositions proportional), so no fraction of it can be explained.</summary>
    public const string NoVariation = "/problems/no-variation";

    /// <summary>The same idempotency key (a sample id under a baseline) sent again with other content (HTTP 409).</summary>
    public const string Conflict = "/problems/conflict";

    /// <summary>A baseline that has been retired and no longer takes screenings (HTTP 410).</summary>
    public const string BaselineRetired = "/problems/baseline-retired";

    /// <summary>The durable store cannot be reached or cannot take the operation now (HTTP 503); retrying later may succeed.</summary>
    public const string StorageUnavailable = "/problems/storage-unavailable";

    /// <summary>A caller over its rate limit for this kind of route (HTTP 429, with <c>Retry-After</c> in seconds).</summary>
    public const string RateLimited = "/problems/rate-limited";

    /// <summary>A computation stopped at the request timeout (HTTP 503); a smaller request, or a later one, may succeed.</summary>
    public const string Timeout = "/problems/timeout";
}
