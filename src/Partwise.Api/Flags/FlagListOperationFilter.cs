using System.Text.Json.Nodes;
using Microsoft.OpenApi;
using Swashbuckle.AspNetCore.SwaggerGen;

namespace Partwise.Api.Flags;

/// <summary>
/// Completes <c>GET /v1/flags</c> in the OpenAPI document: its query parameters are read as text by the handler (so
/// that a bad value gets this service's problem document), but documented with their real types and ranges; the
/// <c>If-None-Match</c> request header and the <c>ETag</c> response header are declared.
/// </summary>
public sealed class FlagListOperationFilter : IOperationFilter
{
    /// <inheritdoc />
    public void Apply(OpenApiOperation operation, OperationFilterContext context)
    {
        ArgumentNullException.ThrowIfNull(operation);
        ArgumentNullException.ThrowIfNull(context);
        if (operation.OperationId != "ListFlags")
        {
            return;
        }

        foreach (var parameter in operation.Parameters?.OfType<OpenApiParameter>() ?? [])
        {
            parameter.Schema = parameter.Name switch
            {
                "limit" => new OpenApiSchema { Type = JsonSchemaType.Integer, Minimum = "1", Maximum = "500", Default = JsonValue.Create(100) },
                "waitSeconds" => new OpenApiSchema { Type = JsonSchemaType.Integer, Minimum = "0", Maximum = "30", Default = JsonValue.Create(0) },
                "status" => new OpenApiSchema
                {
                    Type = JsonSchemaType.String,
                    Enum = [JsonValue.Create("open"), JsonValue.Create("confirmed"), JsonValue.Create("dismissed"), JsonValue.Create("any")],
                    Default = JsonValue.Create("open"),
                },
                _ => parameter.Schema,
            };
        }

        operation.Parameters ??= [];
        operation.Parameters.Add(new OpenApiParameter
        {
            Name = "If-None-Match",
            In = ParameterLocation.Header,
            Required = false,
            Description = "The ETag of an earlier answer to the same query: 304 while nothing changed (with waitSeconds: wait for a change).",
            Schema = new OpenApiSchema { Type = JsonSchemaType.String },
        });

        foreach (var status in new[] { "200", "304" })
        {
            if (operation.Responses?.TryGetValue(status, out var response) == true && response is OpenApiResponse r)
            {
                r.Headers ??= new Dictionary<string, IOpenApiHeader>();
                r.Headers["ETag"] = new OpenApiHeader
                {
                    Description = "Identifies the flags' state for this query: it changes whenever any flag is raised or reviewed.",
                    Schema = new OpenApiSchema { Type = JsonSchemaType.String },
                };
                if (status == "304")
                {
                    r.Description = "Nothing changed since the ETag in If-None-Match (at once, or when waitSeconds passed).";
                }
            }
        }
    }
}
