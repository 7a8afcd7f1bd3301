using Microsoft.AspNetCore.Mvc;
using Microsoft.OpenApi;
using Swashbuckle.AspNetCore.SwaggerGen;

namespace Partwise.Api.Infrastructure.OpenApi;

/// <summary>
/// Describes the problem document as this service writes it: the RFC 9457 members plus <c>errors</c>, a list of
/// {pointer, detail} with RFC 6901 pointers into the request.
/// </summary>
public sealed class ProblemDetailsSchemaFilter : ISchemaFilter
{
    /// <inheritdoc />
    public void Apply(IOpenApiSchema schema, SchemaFilterContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        if (context.Type != typeof(ProblemDetails) || schema is not OpenApiSchema problem)
        {
            return;
        }

        problem.Description = "An RFC 9457 problem document (application/problem+json). Branch on `type`, a stable relative URI such as `/problems/zero-value`; `errors` lists every offending place in the request as an RFC 6901 JSON pointer (for text/csv bodies, the pointer of the equivalent JSON request: `/rows/i/j`).";
        problem.Properties ??= new Dictionary<string, IOpenApiSchema>();
        problem.Properties["errors"] = new OpenApiSchema
        {
            Type = JsonSchemaType.Array,
            Description = "Every offending place in the request.",
            Items = new OpenApiSchema
            {
                Type = JsonSchemaType.Object,
                Required = new HashSet<string> { "pointer", "detail" },
                Properties = new Dictionary<string, IOpenApiSchema>
                {
                    ["pointer"] = new OpenApiSchema { Type = JsonSchemaType.String, Description = "RFC 6901 JSON pointer, e.g. `/rows/3/5`; empty for the whole request." },
                    ["detail"] = new OpenApiSchema { Type = JsonSchemaType.String, Description = "What is wrong there." },
                },
            },
        };
    }
}
