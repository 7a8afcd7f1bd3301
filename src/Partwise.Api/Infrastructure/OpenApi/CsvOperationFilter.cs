using System.Text.Json.Nodes;
using Microsoft.OpenApi;
using Swashbuckle.AspNetCore.SwaggerGen;

namespace Partwise.Api.Infrastructure.OpenApi;

/// <summary>
/// Completes table operations in the OpenAPI document: the JSON request example, the <c>text/csv</c> request body
/// with its query options, the <c>text/csv</c> 200 response, the <c>X-Request-Id</c> header on every response and
/// <c>Retry-After</c> on a 429.
/// </summary>
public sealed class CsvOperationFilter : IOperationFilter
{
    /// <inheritdoc />
    public void Apply(OpenApiOperation operation, OperationFilterContext context)
    {
        ArgumentNullException.ThrowIfNull(operation);
        ArgumentNullException.ThrowIfNull(context);
        var metadata = context.ApiDescription.ActionDescriptor.EndpointMetadata;
        if (metadata.OfType<JsonRequestMetadata>().FirstOrDefault() is { } json)
        {
            var content = new Dictionary<string, IOpenApiMediaType>
            {
                ["application/json"] = new OpenApiMediaType
                {
                    Schema = context.SchemaGenerator.GenerateSchema(json.RequestType, context.SchemaRepository),
                    Example = JsonNode.Parse(json.Example),
                },
            };
            if (metadata.OfType<CsvRequestMetadata>().FirstOrDefault() is { } csv)
            {
                content[CsvTable.MediaType] = new OpenApiMediaType
                {
                    Schema = new OpenApiSchema { Type = JsonSchemaType.String, Description = csv.Description },
                    Example = JsonValue.Create(csv.Example),
                };
                operation.Parameters ??= [];
                foreach (var parameter in csv.Query)
                {
                    var schema = new OpenApiSchema { Type = parameter.IsNumber ? JsonSchemaType.Number : JsonSchemaType.String };
                    if (parameter.Values is { } values)
                    {
                        schema.Enum = [.. values.Select(v => (JsonNode)JsonValue.Create(v))];
                    }

                    operation.Parameters.Add(new OpenApiParameter
                    {
                        Name = parameter.Name,
                        In = ParameterLocation.Query,
                        Required = false,
                        Description = parameter.Description + " Only read with a text/csv body.",
                        Schema = schema,
                    });
                }
            }

            operation.RequestBody = new OpenApiRequestBody { Required = true, Content = content };
        }

        if (operation.Responses is null)
        {
            return;
        }

        foreach (var (status, response) in operation.Responses)
        {
            if (response is not OpenApiResponse r)
            {
                continue;
            }

            r.Headers ??= new Dictionary<string, IOpenApiHeader>();
            r.Headers[RequestId.Header] = new OpenApiHeader
            {
                Description = "The request's id: the caller's own when it sent a sane one (1 to 128 printable ASCII characters), else a new one.",
                Schema = new OpenApiSchema { Type = JsonSchemaType.String },
            };
            if (status == "429")
            {
                r.Headers["Retry-After"] = new OpenApiHeader
                {
                    Description = "Whole seconds until this caller's rate limit lets a request through again.",
                    Schema = new OpenApiSchema { Type = JsonSchemaType.Integer },
                };
            }

            if (status == "200" && metadata.OfType<CsvResponseMetadata>().Any())
            {
                r.Content ??= new Dictionary<string, IOpenApiMediaType>();
                r.Content[CsvTable.MediaType] = new OpenApiMediaType
                {
                    Schema = new OpenApiSchema
                    {
                        Type = JsonSchemaType.String,
                        Description = "Sent when `Accept` prefers text/csv: a header row (a first column `id` when the table has ids), numbers in invariant culture with round-trip precision. The list of imputed cells is JSON-only; their count is in the `Imputed-Cells` header.",
                    },
                };
                r.Headers["Imputed-Cells"] = new OpenApiHeader
                {
                    Description = "With a text/csv response: how many cells the zero policy replaced.",
                    Schema = new OpenApiSchema { Type = JsonSchemaType.Integer },
                };
            }
        }
    }
}
