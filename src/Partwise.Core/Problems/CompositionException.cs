namespace Partwise.Core.Problems;

/// <summary>
/// The one exception the math library throws when a computation cannot proceed on the input it was given
/// (a zero under the reject policy, an unknown part, a singular ratio set...). It carries a stable problem type
/// and one or more JSON pointers into the caller's request, so the host can answer with an RFC 9457 problem
/// document that points at the offending field without knowing any of the math.
/// </summary>
public sealed class CompositionException : Exception
{
    /// <summary>Creates the exception for one offending location.</summary>
    /// <param name="problemType">A stable relative URI from <see cref="ProblemTypes"/>.</param>
    /// <param name="pointer">An RFC 6901 JSON pointer into the request, for example <c>/rows/3/5</c>.</param>
    /// <param name="detail">What is wrong, in words a caller can act on.</param>
    public CompositionException(string problemType, string pointer, string detail)
        : this(problemType, detail, [new ProblemError(pointer, detail)])
    {
    }

    /// <summary>Creates the exception for several offending locations.</summary>
    /// <param name="problemType">A stable relative URI from <see cref="ProblemTypes"/>.</param>
    /// <param name="detail">A summary of what is wrong.</param>
    /// <param name="errors">Every offending location, each with its own detail.</param>
    public CompositionException(string problemType, string detail, IReadOnlyList<ProblemError> errors)
        : base(detail)
    {
        ArgumentException.ThrowIfNullOrEmpty(problemType);
        ArgumentNullException.ThrowIfNull(errors);
        ProblemType = problemType;
        Errors = errors;
    }

    /// <summary>Creates the exception with a generic invalid-input type.</summary>
    public CompositionException()
        : this(ProblemTypes.InvalidInput, "", "The input cannot be computed.")
    {
    }

    /// <summary>Creates the exception with a generic invalid-input type and a message.</summary>
    public CompositionException(string message)
        : this(ProblemTypes.InvalidInput, "", message)
    {
    }

    /// <summary>Creates the exception with a generic invalid-input type, a message and its cause.</summary>
    public CompositionException(string message, Exception innerException)
        : base(message, innerException)
    {
        ProblemType = ProblemTypes.InvalidInput;
        Errors = [new ProblemError("", message)];
    }

    /// <summary>A stable relative URI such as <c>/problems/zero-value</c>; see <see cref="ProblemTypes"/>.</summary>
    public string ProblemType { get; }

    /// <summary>Every offending location in the request, as JSON pointers with details.</summary>
    public IReadOnlyList<ProblemError> Errors { get; }

    /// <summary>
    /// Returns the same problem with every pointer placed under <paramref name="prefix"/>, for callers that
    /// nest a Core input inside a larger request (for example <c>/moments</c>).
    /// </summary>
    public CompositionException WithPointerPrefix(string prefix) =>
        new(ProblemType, Message, [.. Errors.Select(e => e with { Pointer = prefix + e.Pointer })]);
}

/// <summary>One offending location: an RFC 6901 JSON pointer into the request and what is wrong there.</summary>
/// <param name="Pointer">For example <c>/rows/3/5</c> or <c>/transform/denominator</c>.</param>
/// <param name="Detail">What is wrong at that location.</param>
public sealed record ProblemError(string Pointer, string Detail);
