using Microsoft.OpenApi;
using Swashbuckle.AspNetCore.SwaggerGen;

namespace Partwise.Api.Infrastructure.OpenApi;

/// <summary>Adds the <c>image/svg+xml</c> variant to the 200 of operations that can answer with a picture.</summary>
public sealed class PictureOperationFilter : IOperationFilter
{
    /// <inheritdoc />
    public void Apply(OpenApiOperation operation, OperationFilterContext context)
    {
        ArgumentNullException.ThrowIfNull(operation);
        ArgumentNullException.ThrowIfNull(context);
        if (!context.ApiDescription.ActionDescriptor.EndpointMetadata.OfType<SvgResponseMetadata>().Any()
            || operation.Responses?.TryGetValue("200", out var ok) != true
            || ok is not OpenApiResponse response)
        {
            return;
        }

        response.Content ??= new Dictionary<string, IOpenApiMediaType>();
        response.Content[PictureNegotiation.SvgMediaType] = new OpenApiMediaType
        {
            Schema = new OpenApiSchema
            {
                Type = JsonSchemaType.String,
                Description = "Sent when `Accept` prefers image/svg+xml over application/json: a standalone SVG 1.1 document with a `viewBox`, `<title>` and `<desc>`, the picture described in the operation.",
            },
        };
    }
}
