using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics.X86;
using CopyNumber.Kinetics;
using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic.Locality;

/// <summary>
/// The direct method with composition–rejection selection (Slepoy, Thompson &amp; Plimpton 2008) on a memory
/// layout that keeps what one event touches together: reactions and species renumbered by
/// <see cref="DependencyOrder"/> (reverse Cuthill–McKee), each reaction's propensity term kept in its
/// selection entry beside a_j (32 bytes, two to a cache line), and each reaction's count changes and
/// dependents packed in one run of integers that its entry points to. An event then reads the selected
/// entry, one contiguous program, the changed counts, and for each dependent one entry and the counts it
/// reads. Software prefetching of the dependents' entries is available but off (it did not pay when measured).
/// </summary>
/// <remarks>
/// The renumbering is internal: the state the rest of the engine sees (<see cref="SimulatorState.Counts"/>,
/// reaction and species indices in messages, switches) is in the user's order, copied back at every grid
/// time and every stop. The same bits as <see cref="DirectMethod{TSelection}"/> with
/// <see cref="CompositionRejection"/> (the reference): the random numbers are drawn in the same order, every
/// propensity is computed by the same formula from the same operands, the updates of an event are applied
/// in the reference's order (its <see cref="FiringProgram"/>'s, unimolecular ones first) and the entries are
/// set in the user's order at every refresh, so each group's member list holds the same reactions in the
/// same places and the rejection step picks the same one. A test checks this trajectory by trajectory.
/// Applies to the networks <see cref="RefusalFor"/> accepts; the others run the reference.
/// </remarks>
internal sealed class PackedCompositionRejection : ExactSimulation
{
    private const int FormBits = 3;
    private const int SwitchFlag = 1 << 30;
    private const int BroadFlag = 1 << 29;

    private readonly FiringProgram _reference;
    private readonly int[] _rank;
    private readonly int[] _reactionOf;
    private readonly int[] _speciesRank;
    private readonly int[] _speciesOf;
    private readonly long[] _counts;
    private readonly int[] _programStart;
    private readonly int[] _program;
    private readonly bool _prefetch;
    private CompositionRejection _selection;
    private RunawayGuard _guard;
    private int _constantsVersion = -1;

    /// <param name="network">A network <see cref="RefusalFor"/> accepts.</param>
    /// <param name="options">The simulator's options.</param>
    /// <param name="prefetch">
    /// Prefetch each event's dependent entries as soon as the program is read. Off by default: measured on the
    /// synthetic family it cost up to 10–25% below M = 10⁵ and won only 5 of 9 alternating pairs at 10⁵ (the
    /// out-of-order core already issues those independent loads together; docs/performance.md, row 2).
    /// </param>
    /// <param name="renumber">Renumber by <see cref="DependencyOrder"/> (off only for the benchmarks' comparison: packing alone).</param>
    public PackedCompositionRejection(ReactionNetwork network, SimulatorOptions options, bool prefetch = false, bool renumber = true)
        : base(new SimulatorState(network), options.MaxEvents)
    {
        if (RefusalFor(network) is { } refusal) throw new ArgumentException($"the packed layout does not apply: {refusal}", nameof(network));
        _guard = new RunawayGuard(options.RunawayEvents);
        _prefetch = prefetch && Sse.IsSupported;
        var effects = new ReactionEffects(network, includeFired: false);
        _reference = new FiringProgram(effects, State);
        var reactions = State.ReactionCount;
        var species = State.SpeciesCount;
        var propensities = network.Propensities;
        (_rank, _speciesRank) = renumber
            ? DependencyOrder.Compute(effects.DependentStart, effects.Dependents,
                j => propensities.Reactants(j).Select(r => r.Species).Concat(effects.ChangeSpecies[effects.ChangeStart[j]..effects.ChangeStart[j + 1]]),
                species)
            : (Enumerable.Range(0, reactions).ToArray(), Enumerable.Range(0, species).ToArray());
        _reactionOf = Inverse(_rank);
        _speciesOf = Inverse(_speciesRank);
        _counts = new long[species];
        _selection = CompositionRejection.Create(reactions);

        // Programs in the new order: [changes | switch flag, plain updates, updates, (species, amount) × changes, dependents].
        _programStart = new int[reactions];
        var length = 0;
        for (var r = 0; r < reactions; r++)
        {
            var j = _reactionOf[r];
            _programStart[r] = length;
            length += 3 + 2 * (effects.ChangeStart[j + 1] - effects.ChangeStart[j]) + (effects.DependentStart[j + 1] - effects.DependentStart[j]);
        }
        if (length > int.MaxValue >> FormBits) throw new ArgumentException("the network's firing programs are too large for the packed layout", nameof(network));
        _program = new int[length];
        ref var entry0 = ref _selection.Entries;
        for (var r = 0; r < reactions; r++)
        {
            var j = _reactionOf[r];
            ref var entry = ref Unsafe.Add(ref entry0, r);
            var term = State.Terms[j];
            entry.SpeciesA = term.Form is PropensityForm.Constant ? 0 : _speciesRank[term.SpeciesA];
            entry.SpeciesB = term.Form is PropensityForm.Bimolecular ? _speciesRank[term.SpeciesB] : 0;
            entry.FormAndProgram = (_programStart[r] << FormBits) | (int)term.Form;
        }
    }

    /// <summary>
    /// Why the packed layout cannot run <paramref name="network"/>, or null when it can: it handles plain
    /// mass action with at most two reactant molecules, schedules, parameters drawn per cell, two-state
    /// species and broad reactions (their updates gathered at each firing, as the reference does); not laws
    /// that read time, state-triggered changes, bursts or a cell cycle.
    /// </summary>
    public static string? RefusalFor(ReactionNetwork network)
    {
        if (network.TimeDependence.Any) return "laws that read time";
        if (network.Triggers.Count > 0) return "state-triggered changes";
        if (network.Bursts.Any) return "bursts";
        if (network.Cycle is not null) return "a cell cycle";
        var n = network.Stoichiometry;
        for (var j = 0; j < n.ReactionCount; j++)
        {
            if (network.Propensities.Form(j) is not (PropensityForm.Constant or PropensityForm.Unimolecular or PropensityForm.Bimolecular or PropensityForm.Homodimer))
                return "a propensity that is not of mass action with at most two reactant molecules";
            foreach (var amount in n.Changes(j))
                if (amount is > int.MaxValue or < -int.MaxValue) return "a stoichiometric coefficient beyond 2^31";
        }
        return null;
    }

    /// <summary>The reaction order: position of each user reaction index in memory (for the layout's measurements).</summary>
    internal ReadOnlySpan<int> ReactionRank => _rank;

    /// <summary>The species order: position of each user species index in the internal counts.</summary>
    internal ReadOnlySpan<int> SpeciesRank => _speciesRank;

    /// <summary>Where each internal reaction's program starts in the packed run of integers.</summary>
    internal ReadOnlySpan<int> ProgramStart => _programStart;

    private static int[] Inverse(int[] rank)
    {
        var inverse = new int[rank.Length];
        for (var i = 0; i < rank.Length; i++) inverse[rank[i]] = i;
        return inverse;
    }

    protected override void Begin(ref Xoshiro256StarStar rng, double time)
    {
        _selection.Restart();
        Refresh(time);
    }

    protected override void AfterSchedule(double time) => Refresh(time);

    /// <summary>Takes the state's counts and constants, re-evaluates every propensity in the user's order and re-sums a0.</summary>
    private void Refresh(double time)
    {
        if (_constantsVersion != State.ConstantsVersion) RebuildPrograms();
        ref var entry0 = ref _selection.Entries;
        var terms = State.Terms;
        for (var j = 0; j < terms.Length; j++) Unsafe.Add(ref entry0, _rank[j]).Constant = terms[j].Constant;
        var counts = State.Counts;
        for (var i = 0; i < counts.Length; i++) _counts[_speciesRank[i]] = counts[i];
        // The user's order, as the reference sets them: the member lists come out the same.
        for (var j = 0; j < terms.Length; j++) _selection.Set(_rank[j], State.Evaluate(j, time));
        _selection.Resum();
    }

    /// <summary>Copies the reference's update order (it depends on the constants) into the packed programs.</summary>
    private void RebuildPrograms()
    {
        _reference.RefreshConstants(State);
        ref var header0 = ref _reference.Headers;
        ref var change0 = ref _reference.Changes;
        ref var update0 = ref _reference.Updates;
        var switches = State.Switches.TwoState;
        for (var r = 0; r < _rank.Length; r++)
        {
            var j = _reactionOf[r];
            ref var header = ref Unsafe.Add(ref header0, j);
            var p = _programStart[r];
            _program[p] = (header.ChangeEnd - header.ChangeStart) | (switches.ChangedBy(j) ? SwitchFlag : 0) | (header.Broad ? BroadFlag : 0);
            // A broad reaction's updates are gathered at each firing (UpdateBroad); its header's range is then scratch.
            _program[p + 1] = header.Broad ? 0 : header.PlainEnd - header.UpdateStart;
            _program[p + 2] = header.Broad ? 0 : header.UpdateEnd - header.UpdateStart;
            var c = p + 3;
            for (var e = header.ChangeStart; e < header.ChangeEnd; e++)
            {
                ref var change = ref Unsafe.Add(ref change0, e);
                _program[c++] = _speciesRank[change.Species];
                _program[c++] = (int)change.Amount;
            }
            if (header.Broad) continue;
            for (var u = header.UpdateStart; u < header.UpdateEnd; u++) _program[c++] = _rank[Unsafe.Add(ref update0, u).Reaction];
        }
        _constantsVersion = State.ConstantsVersion;
    }

    /// <summary>Copies the internal counts to the state in the user's order.</summary>
    private void StoreCounts()
    {
        var counts = State.Counts;
        for (var s = 0; s < _counts.Length; s++) counts[_speciesOf[s]] = _counts[s];
    }

    /// <summary>The propensities in the user's order (for messages; allocates).</summary>
    private double[] UserPropensities()
    {
        var values = new double[_rank.Length];
        ref var entry0 = ref _selection.Entries;
        for (var j = 0; j < values.Length; j++) values[j] = Unsafe.Add(ref entry0, _rank[j]).Value;
        return values;
    }

    // Fully optimised from the first call, as the reference's loop (a replicate lives in one call).
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    protected override unsafe SegmentEnd Advance(ref Xoshiro256StarStar rng, ref double time, double horizon, GridRecorder recorder, ref long events, long maxEvents)
    {
        ref var count0 = ref MemoryMarshal.GetArrayDataReference(_counts);
        ref var program0 = ref MemoryMarshal.GetArrayDataReference(_program);
        ref var entry0 = ref _selection.Entries;
        var prefetch = _prefetch;
        var random = rng;
        var selection = _selection;
        var t = time;
        var fired = events;
        var nextGrid = recorder.NextTime;
        SegmentEnd end;
        while (true)
        {
            var total = selection.Total;
            if (total > double.MaxValue) FailTotal(t);
            var next = NextEventTime(t, total, ref random);
            if (StopsBefore(next, horizon, fired, maxEvents, out end)) break;
            if (RunawayGuard.Due(fired, maxEvents) && _guard.Exceeded(total, t, horizon, out var projected, out var growth))
                FailRunaway(t, horizon, total, projected, growth);
            if (nextGrid < next)
            {
                StoreCounts();
                nextGrid = recorder.RecordBefore(next, State.Counts);
            }
            t = next;
            var fire = selection.Select(random.NextDouble() * total, ref random);
            var p = Unsafe.Add(ref entry0, fire).FormAndProgram >> FormBits;
            var head = Unsafe.Add(ref program0, p);
            var changes = head & (BroadFlag - 1);
            var plain = Unsafe.Add(ref program0, p + 1);
            var updates = Unsafe.Add(ref program0, p + 2);
            var c = p + 3;
            var dependents = c + 2 * changes;
            if (prefetch)
                for (var u = 0; u < updates; u++)
                    Sse.Prefetch0(Unsafe.AsPointer(ref Unsafe.Add(ref entry0, Unsafe.Add(ref program0, dependents + u))));
            for (; c < dependents; c += 2)
            {
                var species = Unsafe.Add(ref program0, c);
                long amount = Unsafe.Add(ref program0, c + 1);
                ref var count = ref Unsafe.Add(ref count0, species);
                // count + amount cannot overflow: counts stay ≤ 2^62 and |amount| < 2^31. The same test as the
                // reference's count > 2^62 − amount for amount > 0; never true for amount ≤ 0.
                if (count + amount > FiringProgram.CountLimit) FailCount(fire, species, amount, t);
                count += amount;
            }
            if ((head & SwitchFlag) != 0) State.Switches.Fired(_reactionOf[fire]);
            var change = 0.0;
            var d = 0;
            for (; d < plain; d++)
            {
                var k = Unsafe.Add(ref program0, dependents + d);
                ref var entry = ref Unsafe.Add(ref entry0, k);
                change += selection.Replace(k, entry.Constant * Unsafe.Add(ref count0, entry.SpeciesA));
            }
            for (; d < updates; d++)
            {
                var k = Unsafe.Add(ref program0, dependents + d);
                var a = Evaluate(ref Unsafe.Add(ref entry0, k), ref count0);
                if (!PropensityTerm.IsUsable(a)) FailPropensity(k, a, t);
                change += selection.Replace(k, a);
            }
            if ((head & BroadFlag) != 0) change += UpdateBroad(fire, ref selection, t);
            selection.AddToTotal(change);
            selection.EndEvent();
            fired++;
        }
        rng = random;
        _selection = selection;
        events = fired;
        time = t;
        StoreCounts();
        return Finish(end, ref time, horizon, recorder, State.Counts);
    }

    /// <summary>
    /// The updates of broad reaction <paramref name="fire"/> (internal number): gathered by the reference's
    /// program in its order, each evaluated and checked as the reference does (none counts as plain there).
    /// </summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    private double UpdateBroad(int fire, ref CompositionRejection selection, double time)
    {
        var j = _reactionOf[fire];
        ref var header = ref Unsafe.Add(ref _reference.Headers, j);
        _reference.CollectBroad(ref header, j);
        ref var update0 = ref _reference.Updates;
        ref var entry0 = ref selection.Entries;
        ref var count0 = ref MemoryMarshal.GetArrayDataReference(_counts);
        var change = 0.0;
        for (var u = header.UpdateStart; u < header.UpdateEnd; u++)
        {
            var k = _rank[Unsafe.Add(ref update0, u).Reaction];
            var a = Evaluate(ref Unsafe.Add(ref entry0, k), ref count0);
            if (!PropensityTerm.IsUsable(a)) FailPropensity(k, a, time);
            change += selection.Replace(k, a);
        }
        return change;
    }

    /// <summary>a_k from its entry; the same operations in the same order as <see cref="PropensityTerm.Evaluate"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double Evaluate(ref CompositionRejection.Entry entry, ref long counts)
    {
        switch ((PropensityForm)(entry.FormAndProgram & ((1 << FormBits) - 1)))
        {
            case PropensityForm.Constant:
                return entry.Constant;
            case PropensityForm.Unimolecular:
                return entry.Constant * Unsafe.Add(ref counts, entry.SpeciesA);
            case PropensityForm.Bimolecular:
                return entry.Constant * Unsafe.Add(ref counts, entry.SpeciesA) * (double)Unsafe.Add(ref counts, entry.SpeciesB);
            default:
            {
                double x = Unsafe.Add(ref counts, entry.SpeciesA);
                return entry.Constant * x * (x - 1.0);
            }
        }
    }

    // The reference's messages, in the user's numbering, with the state's counts brought up to date first.
    [MethodImpl(MethodImplOptions.NoInlining)]
    private void FailTotal(double time)
    {
        StoreCounts();
        State.ThrowTotalOverflow(time, UserPropensities());
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    private void FailRunaway(double time, double horizon, double total, double projected, double growth)
    {
        StoreCounts();
        State.ThrowRunaway(time, horizon, total, projected, _guard.Bound, growth, UserPropensities());
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    private void FailCount(int reaction, int species, long amount, double time)
    {
        StoreCounts();
        State.ThrowCountOverflow(_reactionOf[reaction], _speciesOf[species], amount, time);
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    private void FailPropensity(int reaction, double value, double time)
    {
        StoreCounts();
        State.ThrowBadPropensity(_reactionOf[reaction], value, time);
    }
}
