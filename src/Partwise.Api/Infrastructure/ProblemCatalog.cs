using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Mvc;
using Partwise.Core.Problems;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// The one table from problem type to HTTP status and title. Shape errors are 400, size limits 413, media types
/// 415, and every other problem the math library raises is well-formed input that cannot be computed: 422.
/// </summary>
public static class ProblemCatalog
{
    private static readonly Dictionary<string, (int Status, string Title)> Entries = new(StringComparer.Ordinal)
    {
        [ProblemTypes.InvalidInput] = (StatusCodes.Status400BadRequest, "The request is malformed"),
        [ProblemTypes.TooLarge] = (StatusCodes.Status413PayloadTooLarge, "The request is too large"),
        [ProblemTypes.UnsupportedMediaType] = (StatusCodes.Status415UnsupportedMediaType, "The request body has an unsupported media type"),
        [ProblemTypes.NotFound] = (StatusCodes.Status404NotFound, "Nothing is at this path"),
        [ProblemTypes.MethodNotAllowed] = (StatusCodes.Status405MethodNotAllowed, "This path does not take this method"),
        [ProblemTypes.Unauthorized] = (StatusCodes.Status401Unauthorized, "The request needs a valid key"),
        [ProblemTypes.Forbidden] = (StatusCodes.Status403Forbidden, "The key does not hold the role this route needs"),
        [ProblemTypes.InternalError] = (StatusCodes.Status500InternalServerError, "The service failed"),
        [ProblemTypes.NonFiniteValue] = (StatusCodes.Status422UnprocessableEntity, "A value is not a finite number"),
        [ProblemTypes.NegativeValue] = (StatusCodes.Status422UnprocessableEntity, "A value is negative"),
        [ProblemTypes.ZeroValue] = (StatusCodes.Status422UnprocessableEntity, "A zero cannot be used"),
        [ProblemTypes.UnknownPart] = (StatusCodes.Status422UnprocessableEntity, "A part is unknown"),
        [ProblemTypes.InvalidZeroPolicy] = (StatusCodes.Status422UnprocessableEntity, "The zero policy cannot be applied"),
        [ProblemTypes.InvalidPartition] = (StatusCodes.Status422UnprocessableEntity, "The partition is not a sequential binary partition"),
        [ProblemTypes.InvalidRatio] = (StatusCodes.Status422UnprocessableEntity, "A ratio is not well formed"),
        [ProblemTypes.SingularRatioSet] = (StatusCodes.Status422UnprocessableEntity, "The ratio set cannot be inverted"),
        [ProblemTypes.InfeasibleRatioValues] = (StatusCodes.Status422UnprocessableEntity, "The ratio values give no composition"),
        [ProblemTypes.ComputationLimit] = (StatusCodes.Status422UnprocessableEntity, "The computation is over a limit"),
        [ProblemTypes.InvalidWeights] = (StatusCodes.Status422UnprocessableEntity, "The weights cannot be used"),
        [ProblemTypes.InvalidMoments] = (StatusCodes.Status422UnprocessableEntity, "The moments cannot be used"),
        [ProblemTypes.InvalidOption] = (StatusCodes.Status422UnprocessableEntity, "An option is out of range"),
        [ProblemTypes.SingularScatter] = (StatusCodes.Status422UnprocessableEntity, "The scatter matrix is singular"),
        [ProblemTypes.TooFewSamples] = (StatusCodes.Status422UnprocessableEntity, "There are too few reference samples"),
        [ProblemTypes.MissingPart] = (StatusCodes.Status422UnprocessableEntity, "A part is missing"),
        [ProblemTypes.DependentRatio] = (StatusCodes.Status422UnprocessableEntity, "A ratio depends on the ones before it"),
        [ProblemTypes.UnsupportedRatioSet] = (StatusCodes.Status422UnprocessableEntity, "The ratio set cannot be back-transformed"),
        [ProblemTypes.NoVariation] = (StatusCodes.Status422UnprocessableEntity, "The data have no log-ratio variance"),
        [ProblemTypes.Conflict] = (StatusCodes.Status409Conflict, "The request conflicts with what is stored"),
        [ProblemTypes.BaselineRetired] = (StatusCodes.Status410Gone, "The baseline is retired"),
        [ProblemTypes.StorageUnavailable] = (StatusCodes.Status503ServiceUnavailable, "Storage is unavailable"),
        [ProblemTypes.RateLimited] = (StatusCodes.Status429TooManyRequests, "Too many requests from this caller"),
        [ProblemTypes.Timeout] = (StatusCodes.Status503ServiceUnavailable, "The computation took too long"),
    };

    /// <summary>The HTTP status of a problem type: 422 for any type not in the table.</summary>
    public static int StatusOf(string problemType) =>
        Entries.TryGetValue(problemType, out var entry) ? entry.Status : StatusCodes.Status422UnprocessableEntity;

    /// <summary>The title of a problem type: a fixed phrase, the same for every occurrence.</summary>
    public static string TitleOf(string problemType) =>
        Entries.TryGetValue(problemType, out var entry) ? entry.Title : "The input cannot be computed";

    /// <summary>The problem document for a <see cref="CompositionException"/>.</summary>
    public static ProblemDetails ToProblemDetails(CompositionException exception)
    {
        ArgumentNullException.ThrowIfNull(exception);
        return Create(exception.ProblemType, exception.Message, exception.Errors);
    }

    /// <summary>The typed result a handler returns for a <see cref="CompositionException"/>.</summary>
    public static ProblemHttpResult ToResult(CompositionException exception) => TypedResults.Problem(ToProblemDetails(exception));

    /// <summary>
    /// Builds an RFC 9457 problem document: <c>type</c>, <c>title</c>, <c>status</c>, <c>detail</c>, and the
    /// extension <c>errors</c> [{pointer, detail}] with RFC 6901 pointers into the request. The request id travels
    /// in the <c>X-Request-Id</c> header of every response, so the document does not repeat it.
    /// </summary>
    public static ProblemDetails Create(string problemType, string detail, IReadOnlyList<ProblemError> errors)
    {
        ArgumentNullException.ThrowIfNull(errors);
        var problem = new ProblemDetails
        {
            Type = problemType,
            Title = TitleOf(problemType),
            Status = StatusOf(problemType),
            Detail = detail,
        };
        problem.Extensions["errors"] = errors.Select(e => new ProblemErrorItem(e.Pointer, e.Detail)).ToArray();
        return problem;
    }
}

/// <summary>One offending location in a problem document.</summary>
/// <param name="Pointer">An RFC 6901 JSON pointer into the request, for example <c>/rows/3/5</c>; empty for the whole request.</param>
/// <param name="Detail">What is wrong at that location.</param>
public sealed record ProblemErrorItem(string Pointer, string Detail);
