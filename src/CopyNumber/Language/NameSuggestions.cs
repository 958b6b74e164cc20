namespace CopyNumber.Language;

/// <summary>
/// "Did you mean" for misspelt names: the closest candidate by optimal-string-alignment distance
/// (Levenshtein edits plus the swap of two neighbouring letters, so 'protien' is one edit from
/// 'protein'; common practice). A candidate must be close relative to the name's length, so short
/// names are not matched to anything at all.
/// </summary>
internal static class NameSuggestions
{
    // Longer names are never compared: the table is quadratic in the length and such names are not typos.
    private const int LongestComparedName = 64;

    /// <summary>The best candidate for <paramref name="unknown"/>, or null when none is close enough. Ties go to the earliest candidate.</summary>
    public static string? Closest(string unknown, IEnumerable<string> candidates)
    {
        if (unknown.Length > LongestComparedName) return null;
        var budget = unknown.Length <= 3 ? 1 : unknown.Length <= 6 ? 2 : 3;
        string? best = null;
        var bestDistance = double.MaxValue;
        foreach (var candidate in candidates)
        {
            if (candidate == unknown || candidate.Length > LongestComparedName) continue;
            if (Math.Abs(candidate.Length - unknown.Length) > budget) continue;
            // A difference in letter case alone is the most likely slip of all.
            double distance = string.Equals(candidate, unknown, StringComparison.OrdinalIgnoreCase)
                ? 0.5
                : Distance(unknown, candidate);
            if (distance > budget || distance >= Math.Max(candidate.Length, unknown.Length) || distance >= bestDistance) continue;
            best = candidate;
            bestDistance = distance;
        }
        return best;
    }

    /// <summary>"; did you mean 'x'?" or an empty string.</summary>
    public static string Hint(string unknown, IEnumerable<string> candidates) =>
        Closest(unknown, candidates) is { } best ? $"; did you mean '{best}'?" : "";

    /// <summary>Optimal string alignment distance (each substring edited at most once).</summary>
    public static int Distance(string a, string b)
    {
        var previous2 = new int[b.Length + 1];
        var previous = new int[b.Length + 1];
        var current = new int[b.Length + 1];
        for (var j = 0; j <= b.Length; j++) previous[j] = j;
        for (var i = 1; i <= a.Length; i++)
        {
            current[0] = i;
            for (var j = 1; j <= b.Length; j++)
            {
                var cost = a[i - 1] == b[j - 1] ? 0 : 1;
                var value = Math.Min(Math.Min(previous[j] + 1, current[j - 1] + 1), previous[j - 1] + cost);
                if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1])
                    value = Math.Min(value, previous2[j - 2] + 1);
                current[j] = value;
            }
            (previous2, previous, current) = (previous, current, previous2);
        }
        return previous[b.Length];
    }
}
