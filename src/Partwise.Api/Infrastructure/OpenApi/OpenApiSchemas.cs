using System.Text.Json.Nodes;
using Microsoft.OpenApi;
using Partwise.Api.Shapes;
using Swashbuckle.AspNetCore.SwaggerGen;

namespace Partwise.Api.Infrastructure.OpenApi;

/// <summary>Schemas for the shapes that have their own JSON converters.</summary>
public static class OpenApiSchemas
{
    /// <summary>Maps each converter-backed type to the schema of what it reads and writes.</summary>
    public static void MapShapes(SwaggerGenOptions options)
    {
        options.MapType<RowMajor>(() => new OpenApiSchema
        {
            Type = JsonSchemaType.Array,
            Description = "A matrix: one array per row, all of the same length.",
            Items = new OpenApiSchema { Type = JsonSchemaType.Array, Items = new OpenApiSchema { Type = JsonSchemaType.Number, Format = "double" } },
        });
        options.MapType<DetectionLimits>(() => new OpenApiSchema
        {
            Description = "One detection limit for every part (a number), or a limit per part name (an object), in the table's units.",
            OneOf =
            [
                new OpenApiSchema { Type = JsonSchemaType.Number, Format = "double", ExclusiveMinimum = "0" },
                new OpenApiSchema { Type = JsonSchemaType.Object, AdditionalProperties = new OpenApiSchema { Type = JsonSchemaType.Number, Format = "double" } },
            ],
        });
        options.MapType<WeightsOption>(() => new OpenApiSchema
        {
            Description = "Part weights: `equal` (default), `mean` (mean closed proportions), or an object from every part to a positive number (normalised to sum 1).",
            OneOf =
            [
                new OpenApiSchema { Type = JsonSchemaType.String, Enum = [JsonValue.Create("equal"), JsonValue.Create("mean")] },
                new OpenApiSchema { Type = JsonSchemaType.Object, AdditionalProperties = new OpenApiSchema { Type = JsonSchemaType.Number, Format = "double" } },
            ],
        });
    }
}
