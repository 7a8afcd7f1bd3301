using System.Text;
using Partwise.Core.Problems;

namespace Partwise.Api.Infrastructure;

/// <summary>Converts the JSONPath that System.Text.Json reports (<c>$.rows[3][5]</c>) to an RFC 6901 pointer (<c>/rows/3/5</c>).</summary>
public static class JsonPathPointer
{
    /// <summary>
    /// The pointer for <paramref name="path"/>: <c>$</c> is the whole document (empty pointer), <c>.name</c> and
    /// <c>['name']</c> are member tokens (escaped per RFC 6901 §3), <c>[n]</c> is an array index.
    /// </summary>
    /// <remarks>
    /// The serializer writes bracketed names without escaping inner quotes, so a bracketed name ends at the first
    /// <c>']</c> that is followed by the end, a dot or a bracket. A path that cannot be read gives the empty pointer.
    /// </remarks>
    public static string ToPointer(string? path)
    {
        if (string.IsNullOrEmpty(path) || path[0] != '$')
        {
            return "";
        }

        var pointer = new StringBuilder();
        var k = 1;
        while (k < path.Length)
        {
            if (path[k] == '.')
            {
                var end = k + 1;
                while (end < path.Length && path[end] != '.' && path[end] != '[')
                {
                    end++;
                }

                pointer.Append('/').Append(JsonPointer.Escape(path[(k + 1)..end]));
                k = end;
            }
            else if (path[k] == '[' && k + 1 < path.Length && path[k + 1] == '\'')
            {
                var end = k + 2;
                while (end < path.Length)
                {
                    var close = path.IndexOf("']", end, StringComparison.Ordinal);
                    if (close < 0)
                    {
                        return pointer.ToString();
                    }

                    if (close + 2 == path.Length || path[close + 2] is '.' or '[')
                    {
                        pointer.Append('/').Append(JsonPointer.Escape(path[(k + 2)..close]));
                        k = close + 2;
                        break;
                    }

                    end = close + 1;
                }
            }
            else if (path[k] == '[')
            {
                var close = path.IndexOf(']', k);
                if (close < 0)
                {
                    return pointer.ToString();
                }

                pointer.Append('/').Append(path, k + 1, close - k - 1);
                k = close + 1;
            }
            else
            {
                return pointer.ToString();
            }
        }

        return pointer.ToString();
    }
}
