namespace Partwise.Api.Tests.Hostile;

/// <summary>One hostile request: what to send, and which family of mutation made it (for the failure message).</summary>
/// <param name="Route">The route it targets, as "METHOD /template".</param>
/// <param name="Family">The mutation family, for example "json-value" or "csv-ragged".</param>
/// <param name="Method">The HTTP method sent (not always the route's: wrong methods are a family).</param>
/// <param name="Target">The path and query sent.</param>
/// <param name="Body">The body, or null for none.</param>
/// <param name="ContentType">The Content-Type header, or null for none.</param>
/// <param name="Headers">Other request headers.</param>
public sealed record HostileCase(
    string Route,
    string Family,
    string Method,
    string Target,
    byte[]? Body,
    string? ContentType,
    IReadOnlyList<KeyValuePair<string, string>> Headers)
{
    /// <summary>A short description for a failure message (the body cut to 300 characters).</summary>
    public override string ToString()
    {
        var body = Body is null ? "(no body)" : System.Text.Encoding.UTF8.GetString(Body, 0, Math.Min(Body.Length, 300));
        var headers = string.Join("; ", Headers.Select(h => $"{h.Key}: {(h.Value.Length > 80 ? h.Value[..80] + "…" : h.Value)}"));
        return $"[{Family}] {Method} {(Target.Length > 200 ? Target[..200] + "…" : Target)} Content-Type: {ContentType ?? "(none)"} {headers} body({Body?.Length ?? 0} bytes): {body}";
    }
}

/// <summary>A route as the app maps it, with what the committed OpenAPI document says of it.</summary>
/// <param name="Method">GET, POST or DELETE.</param>
/// <param name="Template">The route template, for example <c>/v1/baselines/{id}</c>.</param>
/// <param name="QueryNames">The query parameters the OpenAPI document lists.</param>
/// <param name="JsonExample">The application/json body example, if any.</param>
/// <param name="CsvExample">The text/csv body example, if any.</param>
public sealed record HostileRoute(string Method, string Template, IReadOnlyList<string> QueryNames, string? JsonExample, string? CsvExample)
{
    /// <summary>"METHOD /template".</summary>
    public string Key => Method + " " + Template;
}
