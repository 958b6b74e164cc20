using System.Globalization;

namespace CopyNumber.Network;

/// <summary>
/// The two cores of a species that switches between a low and a high mode, fixed before any event is
/// simulated: the low core is x ≤ <see cref="Low"/>, the high core x ≥ <see cref="High"/> (copies), and the
/// counts strictly between them are the boundary region, which belongs to neither mode. A switch is counted
/// when the species enters the core of the other mode than the one it last visited (docs/methods-analysis.md,
/// "Switching statistics").
/// </summary>
/// <param name="Species">Index of the species in the network.</param>
/// <param name="Name">The species' name.</param>
/// <param name="Low">Largest count of the low core (copies, ≥ 0).</param>
/// <param name="High">Smallest count of the high core (copies, &gt; <paramref name="Low"/>).</param>
public sealed record ModeCore(int Species, string Name, long Low, long High)
{
    /// <summary>The mode of a count: 0 in the low core, 1 in the high core, −1 in the boundary region.</summary>
    public int ModeOf(long count) => count <= Low ? 0 : count >= High ? 1 : -1;

    /// <summary>The core as <c>--switching</c> writes it: <c>NAME=LOW..HIGH</c>.</summary>
    public override string ToString() => string.Create(CultureInfo.InvariantCulture, $"{Name}={Low}..{High}");

    /// <summary>The cores as one <c>--switching</c> text (comma-separated), "none" for an empty list.</summary>
    public static string Text(IReadOnlyList<ModeCore> cores)
    {
        ArgumentNullException.ThrowIfNull(cores);
        return cores.Count == 0 ? "none" : string.Join(",", cores.Select(c => c.ToString()));
    }

    /// <summary>
    /// The cores named in <paramref name="text"/> (our own syntax): <c>U=9..21,V=9..21</c> gives species U
    /// a low core U ≤ 9 and a high core U ≥ 21, and V the same; <c>none</c> gives none.
    /// </summary>
    /// <exception cref="ArgumentException">An item is not NAME=LOW..HIGH with whole numbers 0 ≤ LOW &lt; HIGH, names no species, or names one twice.</exception>
    public static IReadOnlyList<ModeCore> Parse(string text, ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(text);
        ArgumentNullException.ThrowIfNull(network);
        var trimmed = text.Trim();
        if (trimmed == "none") return [];
        var cores = new List<ModeCore>();
        foreach (var item in trimmed.Split(',', StringSplitOptions.TrimEntries))
        {
            var parts = item.Split('=', StringSplitOptions.TrimEntries);
            var bounds = parts.Length == 2 ? parts[1].Split("..", StringSplitOptions.TrimEntries) : [];
            if (parts.Length != 2 || parts[0].Length == 0 || bounds.Length != 2
                || !long.TryParse(bounds[0], NumberStyles.None, CultureInfo.InvariantCulture, out var low)
                || !long.TryParse(bounds[1], NumberStyles.None, CultureInfo.InvariantCulture, out var high))
                throw new ArgumentException($"'{item}' is not NAME=LOW..HIGH; write e.g. U=9..21 (low core U ≤ 9, high core U ≥ 21), several separated by commas, or none");
            if (low >= high)
                throw new ArgumentException($"'{item}': the low core's bound {low} must lie below the high core's bound {high}");
            var species = network.SpeciesIndex(parts[0]);
            if (species < 0)
                throw new ArgumentException($"'{parts[0]}' is not a species of the model; it has {string.Join(", ", network.Species.Select(s => $"'{s}'"))}");
            if (cores.Any(c => c.Species == species)) throw new ArgumentException($"'{parts[0]}' is given cores twice");
            cores.Add(new ModeCore(species, parts[0], low, high));
        }
        return cores;
    }
}
