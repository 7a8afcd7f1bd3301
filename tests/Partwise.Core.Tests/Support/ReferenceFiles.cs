namespace Partwise.Core.Tests.Support;

/// <summary>Reads the reference scripts kept under tests/reference in the repository.</summary>
public static class ReferenceFiles
{
    /// <summary>The text of tests/reference/<paramref name="name"/>, found by walking up from the test binaries to service.sln.</summary>
    public static string Read(string name)
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "service.sln")))
        {
            dir = dir.Parent;
        }

        if (dir is null)
        {
            throw new InvalidOperationException("service.sln was not found above the test binaries.");
        }

        return File.ReadAllText(Path.Combine(dir.FullName, "tests", "reference", name));
    }
}
