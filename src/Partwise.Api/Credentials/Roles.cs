namespace Partwise.Api.Credentials;

/// <summary>
/// The roles a key can hold. Each role is also the name of the authorization policy that requires it, so an
/// endpoint declares <c>.RequireRole(Roles.Reader)</c>; <see cref="Admin"/> implies every other role.
/// </summary>
public static class Roles
{
    /// <summary>Reads stored baselines and the flag queue.</summary>
    public const string Reader = "reader";

    /// <summary>Screens samples against stored baselines (and so raises flags).</summary>
    public const string Submitter = "submitter";

    /// <summary>Reviews flags.</summary>
    public const string Reviewer = "reviewer";

    /// <summary>Creates and retires baselines; holds every other role too.</summary>
    public const string Admin = "admin";

    /// <summary>Every role, in the order the documentation lists them.</summary>
    public static IReadOnlyList<string> All { get; } = [Reader, Submitter, Reviewer, Admin];

    /// <summary>Whether <paramref name="role"/> is one of <see cref="All"/> (exact, lowercase).</summary>
    public static bool IsKnown(string? role) => role is not null && All.Contains(role, StringComparer.Ordinal);

    /// <summary>The roles a holder of <paramref name="configured"/> has: those roles, and every role when admin is among them.</summary>
    public static IReadOnlyList<string> Implied(IEnumerable<string> configured)
    {
        ArgumentNullException.ThrowIfNull(configured);
        var roles = configured.Where(IsKnown).Distinct(StringComparer.Ordinal).ToList();
        return roles.Contains(Admin, StringComparer.Ordinal) ? All : roles;
    }
}
