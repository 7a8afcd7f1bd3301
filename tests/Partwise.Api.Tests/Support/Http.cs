using System.Net;
using System.Net.Http.Headers;
using System.Text;
using System.Text.Json;

namespace Partwise.Api.Tests.Support;

/// <summary>Small helpers for posting bodies and reading answers.</summary>
public static class Http
{
    /// <summary>POSTs <paramref name="json"/> as application/json.</summary>
    public static Task<HttpResponseMessage> PostJson(this HttpClient client, string path, string json, string? accept = null) =>
        client.Post(path, json, "application/json", accept);

    /// <summary>POSTs <paramref name="csv"/> as text/csv.</summary>
    public static Task<HttpResponseMessage> PostCsv(this HttpClient client, string path, string csv, string? accept = null) =>
        client.Post(path, csv, "text/csv", accept);

    /// <summary>POSTs a body with the given content type (null: none).</summary>
    public static async Task<HttpResponseMessage> Post(this HttpClient client, string path, string body, string? contentType, string? accept = null)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri(path, UriKind.Relative))
        {
            Content = new ByteArrayContent(Encoding.UTF8.GetBytes(body)),
        };
        if (contentType is not null)
        {
            request.Content.Headers.ContentType = MediaTypeHeaderValue.Parse(contentType);
        }

        if (accept is not null)
        {
            request.Headers.Accept.ParseAdd(accept);
        }

        return await client.SendAsync(request);
    }

    /// <summary>Asserts a 200 JSON answer and returns its root.</summary>
    public static async Task<JsonElement> OkJson(this HttpResponseMessage response)
    {
        var text = await response.Content.ReadAsStringAsync();
        Assert.True(response.StatusCode == HttpStatusCode.OK, $"expected 200, got {(int)response.StatusCode}: {text}");
        Assert.Equal("application/json", response.Content.Headers.ContentType?.MediaType);
        using var document = JsonDocument.Parse(text);
        return document.RootElement.Clone();
    }

    /// <summary>Asserts a 200 CSV answer and returns its lines.</summary>
    public static async Task<string[]> OkCsv(this HttpResponseMessage response)
    {
        var text = await response.Content.ReadAsStringAsync();
        Assert.True(response.StatusCode == HttpStatusCode.OK, $"expected 200, got {(int)response.StatusCode}: {text}");
        Assert.Equal("text/csv", response.Content.Headers.ContentType?.MediaType);
        return text.Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(l => l.TrimEnd('\r')).ToArray();
    }

    /// <summary>
    /// Asserts a problem document with the given status, type and (when given) a pointer among its errors, and
    /// returns the document.
    /// </summary>
    public static async Task<JsonElement> Problem(this HttpResponseMessage response, int status, string type, string? pointer = null)
    {
        var text = await response.Content.ReadAsStringAsync();
        Assert.True((int)response.StatusCode == status, $"expected {status}, got {(int)response.StatusCode}: {text}");
        Assert.Equal("application/problem+json", response.Content.Headers.ContentType?.MediaType);
        using var document = JsonDocument.Parse(text);
        var root = document.RootElement.Clone();
        Assert.Equal(type, root.GetProperty("type").GetString());
        Assert.Equal(status, root.GetProperty("status").GetInt32());
        Assert.False(string.IsNullOrEmpty(root.GetProperty("title").GetString()));
        Assert.False(string.IsNullOrEmpty(root.GetProperty("detail").GetString()));
        if (pointer is not null)
        {
            var pointers = root.GetProperty("errors").EnumerateArray().Select(e => e.GetProperty("pointer").GetString()).ToArray();
            Assert.True(pointers.Contains(pointer), $"expected pointer '{pointer}' among [{string.Join(", ", pointers)}]: {text}");
        }

        return root;
    }

    /// <summary>The numbers of a CSV line after its first <paramref name="skip"/> fields.</summary>
    public static double[] Numbers(string line, int skip = 0) =>
        line.Split(',').Skip(skip).Select(f => double.Parse(f, System.Globalization.CultureInfo.InvariantCulture)).ToArray();
}
