using CopyNumber.Network;

namespace CopyNumber.Ensembles;

/// <summary>
/// Two species whose covariance an ensemble accumulates at every grid time (covariances.parquet;
/// docs/methods.md, "Covariances between species").
/// </summary>
/// <param name="First">Index of the first species in the network, lower than <paramref name="Second"/>.</param>
/// <param name="Second">Index of the second species.</param>
public readonly record struct SpeciesPair(int First, int Second)
{
    /// <summary>
    /// Networks of up to this many species get every pair (at most 45); larger ones only the pairs named by the caller, so
    /// that the memory of a run grows with the pairs asked for, not with the square of the species.
    /// </summary>
    public const int AllPairsUpTo = 10;

    /// <summary>The name under which the moments of the pair's sum are stored (readout-state.parquet): "U+V"; a species name never holds '+'.</summary>
    public static string SumName(string first, string second) => first + "+" + second;

    /// <summary>Every pair of species in declaration order when there are at most <see cref="AllPairsUpTo"/>, none otherwise.</summary>
    public static IReadOnlyList<SpeciesPair> Default(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        var n = network.Species.Count;
        if (n > AllPairsUpTo) return [];
        var pairs = new List<SpeciesPair>(n * (n - 1) / 2);
        for (var i = 0; i < n; i++)
            for (var j = i + 1; j < n; j++) pairs.Add(new SpeciesPair(i, j));
        return pairs;
    }

    /// <summary>
    /// The pairs named in <paramref name="text"/>, "U:V,A:B" (our own syntax), in the order given; "all" for every pair
    /// whatever the count, "none" for no pair.
    /// </summary>
    /// <exception cref="ArgumentException">A name is not a species, a pair names one species twice or repeats an earlier pair, or an item is not NAME:NAME.</exception>
    public static IReadOnlyList<SpeciesPair> Parse(string text, ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(text);
        ArgumentNullException.ThrowIfNull(network);
        var trimmed = text.Trim();
        if (trimmed == "none") return [];
        if (trimmed == "all")
        {
            var n = network.Species.Count;
            return Enumerable.Range(0, n).SelectMany(i => Enumerable.Range(i + 1, n - i - 1).Select(j => new SpeciesPair(i, j))).ToArray();
        }
        var pairs = new List<SpeciesPair>();
        foreach (var item in trimmed.Split(',', StringSplitOptions.TrimEntries))
        {
            var names = item.Split(':', StringSplitOptions.TrimEntries);
            if (names.Length != 2 || names[0].Length == 0 || names[1].Length == 0)
                throw new ArgumentException($"'{item}' is not a pair of species; write pairs as NAME:NAME separated by commas (e.g. U:V,A:B), or all, or none");
            var a = Species(names[0], network);
            var b = Species(names[1], network);
            if (a == b) throw new ArgumentException($"'{item}' names {names[0]} twice; its covariance with itself is its variance, in moments.parquet");
            var pair = new SpeciesPair(Math.Min(a, b), Math.Max(a, b));
            if (pairs.Contains(pair)) throw new ArgumentException($"the pair '{item}' is named twice");
            pairs.Add(pair);
        }
        return pairs;
    }

    private static int Species(string name, ReactionNetwork network)
    {
        var index = network.SpeciesIndex(name);
        return index >= 0 ? index
            : throw new ArgumentException($"'{name}' is not a species of the model; it has {string.Join(", ", network.Species.Select(s => $"'{s}'"))}");
    }
}
