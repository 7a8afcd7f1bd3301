using Microsoft.AspNetCore.Diagnostics;
using Partwise.Api.Infrastructure.Metrics;
using Partwise.Core.Problems;
using Partwise.Storage;

namespace Partwise.Api.Infrastructure;

/// <summary>
/// Writes every exception that reaches the pipeline as a problem document: a <see cref="CompositionException"/>
/// (from request binding) by its type, a <see cref="StorageUnavailableException"/> as a 503, a bad HTTP request from the server by its status, and anything else as a
/// 500 <c>/problems/internal-error</c> that reveals nothing of the failure but the request id.
/// </summary>
public sealed partial class ProblemExceptionHandler(ILogger<ProblemExceptionHandler> logger) : IExceptionHandler
{
    /// <inheritdoc />
    public async ValueTask<bool> TryHandleAsync(HttpContext httpContext, Exception exception, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(httpContext);
        var problem = exception switch
        {
            CompositionException composition => ProblemCatalog.ToProblemDetails(composition),
            StorageUnavailableException => StorageProblem.Details(),
            BadHttpRequestException { StatusCode: StatusCodes.Status413PayloadTooLarge } => ProblemCatalog.Create(ProblemTypes.TooLarge, "The body is larger than the most accepted.", [new ProblemError("", "The body is too large.")]),
            BadHttpRequestException bad => ProblemCatalog.Create(ProblemTypes.InvalidInput, bad.Message, [new ProblemError("", bad.Message)]),
            _ => null,
        };

        if (problem is null)
        {
            if (httpContext.RequestAborted.IsCancellationRequested)
            {
                // The caller went away; there is nobody to answer.
                return true;
            }

            LogUnexpected(logger, exception, httpContext.TraceIdentifier);
            problem = ProblemCatalog.Create(ProblemTypes.InternalError, "The service failed on this request. Quote the X-Request-Id header of this response when reporting it.", []);
        }

        if (exception is StorageUnavailableException storage)
        {
            LogStorageUnavailable(logger, storage.Message, httpContext.TraceIdentifier);
            PartwiseMetrics.StorageUnavailable(RouteTemplate.EndpointOf(httpContext)?.Metadata.GetMetadata<IEndpointNameMetadata>()?.EndpointName);
            httpContext.Response.Headers.RetryAfter = StorageProblem.RetryAfterSeconds;
        }

        await TypedResults.Problem(problem).ExecuteAsync(httpContext).ConfigureAwait(false);
        return true;
    }

    [LoggerMessage(Level = LogLevel.Error, Message = "Unexpected failure on request {RequestId}")]
    private static partial void LogUnexpected(ILogger logger, Exception exception, string requestId);

    [LoggerMessage(Level = LogLevel.Warning, Message = "Storage unavailable on request {RequestId}: {Reason}")]
    private static partial void LogStorageUnavailable(ILogger logger, string reason, string requestId);
}
