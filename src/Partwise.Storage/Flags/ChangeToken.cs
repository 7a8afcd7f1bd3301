namespace Partwise.Storage.Flags;

/// <summary>
/// Identifies the state of the flags: it changes whenever a flag is inserted or reviewed, anywhere, and only then.
/// <see cref="Counter"/> is a change counter kept in the database and bumped in the same transaction as the
/// change; <see cref="Epoch"/> is a random id made when the database was created, so that a database created anew
/// never repeats an old token. The host turns <see cref="ToString"/> into an ETag.
/// </summary>
/// <param name="Epoch">The database's random id.</param>
/// <param name="Counter">The number of flag insertions and reviews committed so far.</param>
public readonly record struct ChangeToken(string Epoch, long Counter)
{
    /// <summary><c>{epoch}-{counter}</c>: letters, digits and one hyphen, fit for an ETag.</summary>
    public override string ToString() => string.Create(System.Globalization.CultureInfo.InvariantCulture, $"{Epoch}-{Counter}");

    /// <summary>True when this token describes a later state than <paramref name="other"/> (or another database).</summary>
    internal bool IsLaterThan(ChangeToken other) =>
        !string.Equals(Epoch, other.Epoch, StringComparison.Ordinal) || Counter > other.Counter;
}
