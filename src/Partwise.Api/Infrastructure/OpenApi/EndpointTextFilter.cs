using Microsoft.AspNetCore.Http.Metadata;
using Microsoft.OpenApi;
using Swashbuckle.AspNetCore.SwaggerGen;

namespace Partwise.Api.Infrastructure.OpenApi;

/// <summary>
/// Keeps each route's own summary and description (<c>WithSummary</c>, <c>WithDescription</c>) over the handler's
/// XML summary, which speaks of the method rather than of the route. Register it after the XML comments.
/// </summary>
public sealed class EndpointTextFilter : IOperationFilter
{
    /// <inheritdoc />
    public void Apply(OpenApiOperation operation, OperationFilterContext context)
    {
        ArgumentNullException.ThrowIfNull(operation);
        ArgumentNullException.ThrowIfNull(context);
        var metadata = context.ApiDescription.ActionDescriptor.EndpointMetadata;
        if (metadata.OfType<IEndpointSummaryMetadata>().LastOrDefault() is { } summary)
        {
            operation.Summary = summary.Summary;
        }

        if (metadata.OfType<IEndpointDescriptionMetadata>().LastOrDefault() is { } description)
        {
            operation.Description = description.Description;
        }
    }
}
