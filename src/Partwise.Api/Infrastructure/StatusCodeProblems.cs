using Partwise.Core.Problems;

namespace Partwise.Api.Infrastructure;

/// <summary>Turns bodiless error statuses from routing (404, 405) into problem documents with stable types.</summary>
public static class StatusCodeProblems
{
    /// <summary>Adds the status-code-pages middleware with problem documents.</summary>
    public static IApplicationBuilder UseStatusCodeProblems(this IApplicationBuilder app) =>
        app.UseStatusCodePages(static async context =>
        {
            var http = context.HttpContext;
            var (type, detail) = http.Response.StatusCode switch
            {
                StatusCodes.Status404NotFound => (ProblemTypes.NotFound, $"There is no resource at '{http.Request.Path}'; see /docs for the routes."),
                StatusCodes.Status405MethodNotAllowed => (ProblemTypes.MethodNotAllowed, $"'{http.Request.Path}' does not take {http.Request.Method}."),
                _ => ((string?)null, (string?)null),
            };
            if (type is null)
            {
                await TypedResults.Problem(statusCode: http.Response.StatusCode).ExecuteAsync(http).ConfigureAwait(false);
                return;
            }

            await TypedResults.Problem(ProblemCatalog.Create(type, detail!, [])).ExecuteAsync(http).ConfigureAwait(false);
        });
}
