using System.Text.Json;

namespace Partwise.Deployment.Tests.Support;

/// <summary>The routes of the committed contract, openapi/partwise.v1.json (a test of the API project keeps it equal to the served one).</summary>
internal static class Routes
{
    /// <summary>True when the contract has a GET operation on exactly this path.</summary>
    public static bool HasGet(string path)
    {
        using var document = JsonDocument.Parse(Repository.Read("openapi/partwise.v1.json"));
        return document.RootElement.GetProperty("paths").TryGetProperty(path, out var item) && item.TryGetProperty("get", out _);
    }
}
