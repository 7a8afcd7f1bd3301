namespace Partwise.Core.Tests.Support;

/// <summary>Random sequential binary partitions: split the whole set, then every group of two or more, at random.</summary>
public static class RandomPartitions
{
    /// <summary>J − 1 sign rows of a random sequential binary partition of J parts, rows in a shuffled order.</summary>
    public static int[][] Draw(int parts, Random random)
    {
        ArgumentNullException.ThrowIfNull(random);
        var rows = new List<int[]>();
        var groups = new Queue<int[]>();
        groups.Enqueue([.. Enumerable.Range(0, parts).OrderBy(_ => random.Next())]);
        while (groups.Count > 0)
        {
            var group = groups.Dequeue();
            var cut = 1 + random.Next(group.Length - 1);
            var row = new int[parts];
            foreach (var k in group[..cut])
            {
                row[k] = 1;
            }

            foreach (var k in group[cut..])
            {
                row[k] = -1;
            }

            rows.Add(row);
            foreach (var side in new[] { group[..cut], group[cut..] })
            {
                if (side.Length > 1)
                {
                    groups.Enqueue(side);
                }
            }
        }

        return [.. rows.OrderBy(_ => random.Next())];
    }
}
