using CopyNumber.Network;

namespace CopyNumber.MasterEquation;

/// <summary>
/// The generator A of the master equation dP/dt = A·P restricted to a projection, in the form the
/// sparse product needs: for each state k (a row), the transitions into it (source state, rate a_j(x))
/// in compressed rows, and each state's total exit rate a₀(x) = Σ_j a_j(x), including the transitions
/// that leave the projection (the "sink" of Munsky &amp; Khammash 2006: their probability is lost, not
/// reflected, which is what makes the projected solution a lower bound on the true one). Also kept: each
/// state's rate of leaving the projection, which says in which directions the projection must grow.
/// Immutable once built; rebuilt when the projection grows or a parameter changes.
/// </summary>
public sealed class Generator
{
    // Each state's outgoing transitions, m slots per state (target, or −1 outside the projection or at a zero propensity),
    // kept so that a grown projection re-derives only the rows that changed (see Extend).
    private readonly int[] _targets;
    private readonly double[] _rates;

    private Generator(int states, int[] targets, double[] rates, int[] rowStart, int[] source, double[] rate, double[] exit, double[] leak, int[] leakReactions)
    {
        States = states;
        _targets = targets;
        _rates = rates;
        RowStart = rowStart;
        Source = source;
        Rate = rate;
        Exit = exit;
        Leak = leak;
        LeakReactions = leakReactions;
        var largest = 0.0;
        foreach (var e in exit) largest = Math.Max(largest, e);
        LargestExitRate = largest;
    }

    /// <summary>Number of states (rows).</summary>
    public int States { get; }

    /// <summary>Row k's transitions are entries [RowStart[k], RowStart[k+1]).</summary>
    internal int[] RowStart { get; }

    /// <summary>Source state of each entry.</summary>
    internal int[] Source { get; }

    /// <summary>Rate of each entry, per unit time.</summary>
    internal double[] Rate { get; }

    /// <summary>a₀ per state, per unit time.</summary>
    internal double[] Exit { get; }

    /// <summary>Rate of leaving the projection per state, per unit time.</summary>
    internal double[] Leak { get; }

    /// <summary>Per state, a bit mask of the reactions (first 32) whose firing leaves the projection; all bits for the rest.</summary>
    internal int[] LeakReactions { get; }

    /// <summary>Transitions stored (nonzero off-diagonal entries).</summary>
    public long Entries => Source.Length;

    /// <summary>max a₀ over the projection, the uniformisation rate Λ.</summary>
    public double LargestExitRate { get; }

    /// <summary>Builds the generator of <paramref name="network"/> on <paramref name="space"/> for the given propensity constants and parameters.</summary>
    /// <exception cref="MasterEquationException">A rate law is negative or not finite on some state, or drives a count below zero.</exception>
    public static Generator Build(StateSpace space, ReactionNetwork network, double[] constants, double[] parameters, ParallelOptions parallel)
    {
        ArgumentNullException.ThrowIfNull(space);
        ArgumentNullException.ThrowIfNull(network);
        var n = space.Count;
        var m = network.Reactions.Count;
        var rows = new Rows(new int[(long)n * m], new double[(long)n * m], new double[n], new double[n], new int[n]);
        Derive(space, network, constants, parameters, parallel, rows, _ => true);
        return Assemble(n, m, rows);
    }

    /// <summary>
    /// The generator on <paramref name="space"/> after the projection grew from this one's states (states are only ever
    /// appended, and the constants and parameters are those this one was built with): only the new states' rows and those of
    /// the states that had a transition leaving the old projection are derived again; the rest are copied. The result is
    /// identical, entry for entry and bit for bit, to <see cref="Build"/> on the grown space (the same propensities in the
    /// same order); it saves the propensity evaluations and state lookups of the interior, most of a rebuild's cost.
    /// </summary>
    /// <exception cref="MasterEquationException">As <see cref="Build"/>.</exception>
    public Generator Extend(StateSpace space, ReactionNetwork network, double[] constants, double[] parameters, ParallelOptions parallel)
    {
        ArgumentNullException.ThrowIfNull(space);
        ArgumentNullException.ThrowIfNull(network);
        var n = space.Count;
        var m = network.Reactions.Count;
        if (n < States || _targets.LongLength != (long)States * m) throw new ArgumentException("the space does not extend the one this generator was built on", nameof(space));
        var rows = new Rows(new int[(long)n * m], new double[(long)n * m], new double[n], new double[n], new int[n]);
        Array.Copy(_targets, rows.Targets, _targets.LongLength);
        Array.Copy(_rates, rows.Rates, _rates.LongLength);
        Array.Copy(Exit, rows.Exit, States);
        Array.Copy(Leak, rows.Leak, States);
        Array.Copy(LeakReactions, rows.LeakReactions, States);
        var oldStates = States;
        var oldLeak = Leak;
        Derive(space, network, constants, parameters, parallel, rows, i => i >= oldStates || oldLeak[i] > 0);
        return Assemble(n, m, rows);
    }

    /// <summary>Per state, its m outgoing slots, total exit rate, rate and reactions of leaving.</summary>
    private sealed record Rows(int[] Targets, double[] Rates, double[] Exit, double[] Leak, int[] LeakReactions);

    /// <summary>Derives the rows of the states that <paramref name="derive"/> selects.</summary>
    private static void Derive(StateSpace space, ReactionNetwork network, double[] constants, double[] parameters, ParallelOptions parallel, Rows rows, Func<int, bool> derive)
    {
        var m = network.Reactions.Count;
        var (targets, rates, exit, leak, leakReactions) = (rows.Targets, rows.Rates, rows.Exit, rows.Leak, rows.LeakReactions);
        string? failure = null;
        var n = space.Count;
        Parallel.For(0, Chunks(n), parallel, () => (new long[network.Species.Count], new int[space.Dimension]), (chunk, _, scratch) =>
        {
            var (counts, key) = scratch;
            var (first, end) = ChunkRange(chunk, n);
            for (var i = first; i < end; i++)
            {
                if (!derive(i)) continue;
                space.Counts(i, counts);
                double total = 0, outside = 0;
                var mask = 0;
                for (var j = 0; j < m; j++)
                {
                    var slot = (long)i * m + j;
                    targets[slot] = -1;
                    rates[slot] = 0;
                    var a = network.Propensities.Evaluate(j, counts, constants, parameters);
                    if (a == 0) continue;
                    if (!(a > 0) || double.IsInfinity(a))
                    {
                        failure ??= $"the propensity of reaction '{network.Reactions[j].Name}' is {a} at counts ({string.Join(", ", counts)}); it must be a nonnegative finite number";
                        continue;
                    }
                    total += a;
                    network.Stoichiometry.Apply(j, counts);
                    var valid = true;
                    foreach (var x in counts) valid &= x >= 0;
                    if (!valid) failure ??= $"reaction '{network.Reactions[j].Name}' has a positive propensity at a state where it would make a count negative";
                    var target = valid && space.Coding.TryEncode(counts, key) ? space.IndexOf(key) : -1;
                    network.Stoichiometry.Apply(j, counts, -1);
                    if (target < 0)
                    {
                        outside += a;
                        mask |= j < 32 ? 1 << j : -1;
                        continue;
                    }
                    targets[slot] = target;
                    rates[slot] = a;
                }
                exit[i] = total;
                leak[i] = outside;
                leakReactions[i] = mask;
            }
            return scratch;
        }, _ => { });
        if (failure is not null) throw new MasterEquationException(failure);
    }

    /// <summary>Counting sort of the transitions by target: rows of incoming entries.</summary>
    private static Generator Assemble(int n, int m, Rows rows)
    {
        var targets = rows.Targets;
        var rowStart = new int[n + 1];
        foreach (var t in targets) if (t >= 0) rowStart[t + 1]++;
        for (var k = 0; k < n; k++) rowStart[k + 1] += rowStart[k];
        var fill = rowStart[..n];
        var source = new int[rowStart[n]];
        var rate = new double[rowStart[n]];
        for (long s = 0; s < targets.LongLength; s++)
        {
            var t = targets[s];
            if (t < 0) continue;
            var e = fill[t]++;
            source[e] = (int)(s / m);
            rate[e] = rows.Rates[s];
        }
        return new Generator(n, targets, rows.Rates, rowStart, source, rate, rows.Exit, rows.Leak, rows.LeakReactions);
    }

    /// <summary>Rows are handed to threads in this many chunks: enough for balance, few enough to keep scheduling cheap.</summary>
    internal static int Chunks(int rows) => Math.Max(1, Math.Min(64, rows / 2048));

    /// <summary>Rows [from, to) of chunk <paramref name="chunk"/>.</summary>
    internal static (int From, int To) ChunkRange(int chunk, int rows)
    {
        var chunks = Chunks(rows);
        return ((int)((long)rows * chunk / chunks), (int)((long)rows * (chunk + 1) / chunks));
    }
}
