using System.Numerics;
using CopyNumber.Language;

namespace CopyNumber.Network;

/// <summary>
/// The integers a count quantity can take, Offset + Spacing·ℤ. A quantity changes only by reaction
/// firings and scheduled changes, so every value it can reach differs from its initial value by an
/// integer combination of those changes: it lives on the lattice whose spacing is their greatest common
/// divisor (e.g. A in <c>3 A &lt;-&gt; T</c> moves in steps of 3). Spacing 1 is the plain integers.
/// </summary>
/// <param name="Spacing">Distance between neighbouring lattice points, in copies (≥ 1).</param>
/// <param name="Offset">A value on the lattice (the quantity's initial value), in copies.</param>
public readonly record struct CountLattice(long Spacing, long Offset)
{
    /// <summary>The plain integers (spacing 1).</summary>
    public static CountLattice Integers { get; } = new(1, 0);

    /// <summary>Whether <paramref name="value"/> lies on the lattice.</summary>
    public bool Contains(long value) => Spacing <= 1 || Modulo(value - Offset, Spacing) == 0;

    /// <summary>The lattice index of a value on it, (value − Offset)/Spacing, rounded down for a value off it.</summary>
    public long IndexOf(long value) => Spacing <= 1 ? value - Offset : FloorDivide(value - Offset, Spacing);

    /// <summary>The value at lattice index <paramref name="index"/>, Offset + Spacing·index.</summary>
    public long ValueAt(long index) => Offset + Spacing * index;

    private static long Modulo(long a, long m) => ((a % m) + m) % m;

    private static long FloorDivide(long a, long m) => (a - Modulo(a, m)) / m;
}

/// <summary>
/// The lattice of one species or count readout over a run, from the model alone (never from a sample).
/// The rule, stated in docs/methods-analysis.md: the spacing is the greatest common divisor of
/// (1) the quantity's change in every reaction (its row of N, or for a readout c₀ + Σ cᵢ·xᵢ the
/// combination Σ cᵢ·N_ij of rows), and (2) the changes made by the schedule up to the time asked:
/// adding or subtracting a fixed number a to species i contributes cᵢ·a; setting species i to a fixed
/// number v contributes cᵢ·(v − xᵢ(0)) and cᵢ·gᵢ (gᵢ species i's own spacing, since the value replaced
/// was anywhere on species i's lattice); a change whose value depends on the state or on parameters
/// breaks the lattice (spacing 1) from its time on. The offset is the quantity's initial value. The
/// spacings only get finer with time, so the lattice at a time also holds every earlier value. When a
/// change takes effect is the <see cref="Timeline"/>'s rule (one coincidence rule for every consumer):
/// a grid time on a change reads as after it.
/// </summary>
public sealed class QuantityLattice
{
    private readonly double[] _from;
    private readonly long[] _spacing;

    private QuantityLattice(long offset, double[] from, long[] spacing)
    {
        Offset = offset;
        _from = from;
        _spacing = spacing;
    }

    /// <summary>The quantity's initial value, a point of every lattice it has.</summary>
    public long Offset { get; }

    /// <summary>A quantity on the plain integers at all times (no lattice known).</summary>
    public static QuantityLattice Integers { get; } = new(0, [double.NegativeInfinity], [1]);

    /// <summary>
    /// The lattice in force at <paramref name="time"/> (model time units): a grid time of the timeline
    /// the lattice was built on, compared exactly with the changes' effective times.
    /// </summary>
    public CountLattice At(double time)
    {
        var s = 0;
        for (var k = 1; k < _from.Length; k++)
            if (time >= _from[k]) s = k;
        return new CountLattice(_spacing[s], Offset);
    }

    /// <summary>
    /// The lattice of the quantity named <paramref name="name"/>: a species, or a readout that is an
    /// integer combination of species (<see cref="Readout.IsCount"/>); null for anything else.
    /// </summary>
    /// <param name="network">The compiled network.</param>
    /// <param name="name">A species or readout name.</param>
    /// <param name="grid">The run's grid, which decides when each change takes effect (<see cref="Timeline"/>).</param>
    public static QuantityLattice? For(ReactionNetwork network, TimeGrid grid, string name)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(grid);
        var species = network.SpeciesIndex(name);
        if (species >= 0)
        {
            var unit = new long[network.Species.Count];
            unit[species] = 1;
            return ForCombination(network, grid, 0, unit);
        }
        var readout = network.Readouts.FirstOrDefault(r => r.Name == name);
        if (readout is null || !readout.IsCount) return null;
        var (constant, coefficients) = Coefficients(network, readout);
        return ForCombination(network, grid, constant, coefficients);
    }

    /// <summary>The lattice of c₀ + Σ cᵢ·xᵢ (counts xᵢ of the network's species).</summary>
    /// <param name="network">The compiled network.</param>
    /// <param name="grid">The run's grid, which decides when each change takes effect (<see cref="Timeline"/>).</param>
    /// <param name="constant">c₀.</param>
    /// <param name="coefficients">cᵢ, one per species.</param>
    public static QuantityLattice ForCombination(ReactionNetwork network, TimeGrid grid, long constant, IReadOnlyList<long> coefficients)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(grid);
        var schedule = Timeline.Of(network, grid).Changes.ToArray();
        ArgumentNullException.ThrowIfNull(coefficients);
        if (coefficients.Count != network.Species.Count)
            throw new ArgumentException($"a combination needs one coefficient per species ({network.Species.Count}), not {coefficients.Count}", nameof(coefficients));
        // Division splits every count (binomially or in halves), so any whole number can follow.
        if (network.Cycle is not null) return Integers;
        var offset = constant;
        for (var i = 0; i < coefficients.Count; i++) offset += coefficients[i] * network.InitialCounts[i];

        long spacing = 0;
        var n = network.Stoichiometry;
        for (var j = 0; j < n.ReactionCount; j++)
        {
            long change = 0;
            var changed = n.ChangedSpecies(j);
            var amounts = n.Changes(j);
            for (var e = 0; e < changed.Length; e++) change += coefficients[changed[e]] * amounts[e];
            spacing = Gcd(spacing, change);
        }

        // Each species' own spacing (with the schedule) is needed for 'set': the value it replaces is
        // anywhere on that species' lattice.
        // One pass over N's non-zero entries: linear in the network, not species × reactions.
        var ownSpacing = new long[coefficients.Count];
        for (var j = 0; j < n.ReactionCount; j++)
        {
            var changed = n.ChangedSpecies(j);
            var amounts = n.Changes(j);
            for (var e = 0; e < changed.Length; e++)
                if (coefficients[changed[e]] != 0) ownSpacing[changed[e]] = Gcd(ownSpacing[changed[e]], amounts[e]);
        }
        for (var i = 0; i < coefficients.Count; i++)
        {
            if (coefficients[i] == 0) continue;
            var g = ownSpacing[i];
            foreach (var change in schedule)
                if (change.Target == ScheduleTarget.Species && change.TargetIndex == i && FixedValue(network, change) is { } v)
                    g = Gcd(g, change.Operation == ScheduleOperation.Set ? v - network.InitialCounts[i] : v);
            ownSpacing[i] = g;
        }

        var from = new List<double> { double.NegativeInfinity };
        var spacings = new List<long> { Positive(spacing) };
        var broken = false;
        foreach (var change in schedule)
        {
            if (change.Target != ScheduleTarget.Species) continue;
            var c = coefficients[change.TargetIndex];
            if (c == 0) continue;
            if (FixedValue(network, change) is not { } v) broken = true;
            else if (change.Operation == ScheduleOperation.Set)
                spacing = Gcd(Gcd(spacing, c * (v - network.InitialCounts[change.TargetIndex])), c * ownSpacing[change.TargetIndex]);
            else spacing = Gcd(spacing, c * v);
            var now = broken ? 1 : Positive(spacing);
            if (now != spacings[^1])
            {
                from.Add(change.Time);
                spacings.Add(now);
            }
            if (broken) break;
        }
        return new QuantityLattice(offset, from.ToArray(), spacings.ToArray());
    }

    // A readout that is an integer combination is affine in the counts, f(x) = c₀ + Σ cᵢ·xᵢ, with no
    // parameters (Readout.IsCount excludes them), so f(0) and f(eᵢ) − f(0) give its coefficients.
    private static (long Constant, long[] Coefficients) Coefficients(ReactionNetwork network, Readout readout)
    {
        var parameters = network.InitialParameterValues.ToArray();
        var counts = new long[network.Species.Count];
        var constant = (long)Math.Round(readout.OnCounts(counts, parameters));
        var coefficients = new long[counts.Length];
        for (var i = 0; i < counts.Length; i++)
        {
            counts[i] = 1;
            coefficients[i] = (long)Math.Round(readout.OnCounts(counts, parameters)) - constant;
            counts[i] = 0;
        }
        return (constant, coefficients);
    }

    // The rounded amount of a scheduled species change when it is a fixed number, or null when it
    // depends on the state or the parameters. The compiled law keeps no syntax, so it is evaluated at
    // distinct, unrelated states and parameter vectors: a fixed number gives the same value at all.
    private static long? FixedValue(ReactionNetwork network, ScheduledChange change)
    {
        var species = network.Species.Count;
        double? first = null;
        for (var probe = 0; probe < 3; probe++)
        {
            var counts = new long[species];
            for (var i = 0; i < species; i++) counts[i] = probe == 0 ? 0 : 1000 * probe + 37 * i + 11 * probe * i;
            var parameters = network.InitialParameterValues.Select((p, i) => probe == 0 ? p : p * (1.5 + probe) + 0.25 * (i + probe)).ToArray();
            var value = change.OnCounts(counts, parameters);
            if (!double.IsFinite(value)) return null;
            first ??= value;
            if (value != first) return null;
        }
        return (long)Math.Round(first!.Value, MidpointRounding.AwayFromZero);
    }

    private static long Positive(long spacing) => spacing == 0 ? 1 : spacing;

    private static long Gcd(long a, long b) => (long)BigInteger.GreatestCommonDivisor(a, b);
}
