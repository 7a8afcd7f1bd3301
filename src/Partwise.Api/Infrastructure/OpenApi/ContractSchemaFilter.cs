using System.ComponentModel.DataAnnotations;
using System.Reflection;
using System.Text.Json;
using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using Microsoft.OpenApi;
using Swashbuckle.AspNetCore.SwaggerGen;

namespace Partwise.Api.Infrastructure.OpenApi;

/// <summary>
/// Makes the schemas of this service's records say what the service does: unknown members are allowed (they are
/// ignored, for forward compatibility), and a member is never documented as nullable, because null is read as
/// absent and absent members are never written. Members with <see cref="AllowedValuesAttribute"/> get an
/// <c>enum</c>, and XML-doc line breaks are folded into single spaces.
/// </summary>
public sealed partial class ContractSchemaFilter : ISchemaFilter
{
    /// <inheritdoc />
    public void Apply(IOpenApiSchema schema, SchemaFilterContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        if (schema is not OpenApiSchema s || context.Type.Namespace?.StartsWith("Partwise.Api", StringComparison.Ordinal) != true)
        {
            return;
        }

        s.AdditionalPropertiesAllowed = true;
        s.AdditionalProperties = null;
        s.Description = Fold(s.Description);
        if (s.Properties is null)
        {
            return;
        }

        foreach (var (name, value) in s.Properties)
        {
            if (value is not OpenApiSchema property)
            {
                continue;
            }

            property.Description = Fold(property.Description);
            if (property.Type is { } type && type != JsonSchemaType.Null)
            {
                property.Type = type & ~JsonSchemaType.Null;
            }

            if (property.OneOf is { } oneOf)
            {
                property.OneOf = [.. oneOf.Where(o => o is not OpenApiSchema { Type: JsonSchemaType.Null })];
            }

            var member = context.Type.GetProperties(BindingFlags.Public | BindingFlags.Instance)
                .FirstOrDefault(p => JsonNamingPolicy.CamelCase.ConvertName(p.Name) == name);
            if (member?.GetCustomAttribute<AllowedValuesAttribute>() is { } allowed)
            {
                property.Enum = [.. allowed.Values.Select(v => (JsonNode)JsonValue.Create(v?.ToString())!)];
            }
        }
    }

    private static string? Fold(string? text) => text is null ? null : Whitespace().Replace(text, " ").Trim();

    [GeneratedRegex(@"\s+")]
    private static partial Regex Whitespace();
}
