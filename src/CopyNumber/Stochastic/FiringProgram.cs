using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using CopyNumber.Kinetics;

namespace CopyNumber.Stochastic;

/// <summary>
/// What one firing of each reaction does, precompiled as a flat instruction list for the exact methods'
/// inner loops: the count changes, each with its overflow headroom, then the propensity updates of the
/// reactions that read a changed species (the dependency graph of Gibson &amp; Bruck 2000, J. Phys. Chem. A
/// 104:1876), each carrying its own propensity term so an update reads one small record and one count.
/// </summary>
/// <remarks>
/// Overflow: no count may exceed <see cref="CountLimit"/> = 2^62. A change of +d is allowed only while
/// the count is at most 2^62 − d, one compare per change (negative changes get a headroom that never
/// trips). Below 2^62 a count converts to double and multiplies in the bimolecular forms without
/// overflowing, and the sum of two counts still fits in a long.
/// The terms' constants are copies: <see cref="RefreshConstants"/> must follow every parameter change.
/// A broad reaction (<see cref="Network.DependencyGraph"/>, affected list not stored) has no update list of
/// its own: at each of its firings <see cref="Fire"/>, on the out-of-line path it already takes for rate
/// laws that may over-consume, gathers the readers of the changed species from per-species reader blocks,
/// each reaction once, into a scratch region at the end of the update list and points the header's update
/// range at it. The simulators' loops are the same for both kinds, and the program stays linear in the
/// network: reader blocks (one record per species read) and a scratch of one record per reaction.
/// </remarks>
internal sealed class FiringProgram
{
    /// <summary>The largest copy number a simulator lets a species reach: 2^62.</summary>
    public const long CountLimit = 1L << 62;

    private readonly Header[] _headers;
    private readonly CountChange[] _changes;
    private readonly PropensityUpdate[] _updates;
    private readonly SimulatorState _state;
    private readonly bool _includeFired;
    private readonly int[] _changeStart;
    private readonly int[] _changeSpecies;
    private readonly int[] _blockStart = [];    // species i's reader block: _updates[_blockStart[i] .. _blockStart[i+1]−1]
    private readonly int _scratch;              // _updates[_scratch ..] holds the updates of the broad reaction firing now
    private readonly int[] _stamp = [];         // per reaction, the CollectBroad call that last took it
    private int _stampValue;
    private int _constantsVersion = -1;

    /// <summary>Compiles the program from the effects' changes and dependents and the state's terms.</summary>
    public FiringProgram(ReactionEffects effects, SimulatorState state)
    {
        var reactions = state.ReactionCount;
        _headers = new Header[reactions];
        _changes = new CountChange[effects.ChangeSpecies.Length];
        var anyBroad = effects.IsBroad.Contains(true);
        var narrow = effects.Dependents.Length;
        // Reader blocks and scratch only when some reaction needs them: an ordinary network's program is as before.
        _scratch = narrow + (anyBroad ? effects.Readers.Length : 0);
        _updates = new PropensityUpdate[_scratch + (anyBroad ? reactions : 0)];
        if (anyBroad)
        {
            _blockStart = new int[effects.ReaderStart.Length];
            for (var i = 0; i < _blockStart.Length; i++) _blockStart[i] = narrow + effects.ReaderStart[i];
            _stamp = new int[reactions];
        }
        for (var j = 0; j < reactions; j++)
        {
            _headers[j] = new Header
            {
                ChangeStart = effects.ChangeStart[j],
                ChangeEnd = effects.ChangeStart[j + 1],
                UpdateStart = effects.DependentStart[j],
                UpdateEnd = effects.DependentStart[j + 1],
                OutOfLine = effects.MayMakeNegative[j] || effects.IsBroad[j] || state.Network.Bursts.Makes(j),
                MakesBurst = state.Network.Bursts.Makes(j),
                CheckConsumption = effects.MayMakeNegative[j],
                CountsSwitch = state.Switches.TwoState.ChangedBy(j),
                WatchesMode = state.Modes.WatchedBy(j),
                ChecksTriggers = state.Triggers.WatchedBy(j),
                Broad = effects.IsBroad[j],
            };
        }
        for (var e = 0; e < _changes.Length; e++)
        {
            var amount = effects.ChangeAmount[e];
            _changes[e] = new CountChange
            {
                Species = effects.ChangeSpecies[e],
                Amount = amount,
                Headroom = amount > 0 ? CountLimit - amount : long.MaxValue,
            };
        }
        for (var u = 0; u < _scratch; u++)
        {
            var k = u < narrow ? effects.Dependents[u] : effects.Readers[u - narrow];
            _updates[u] = new PropensityUpdate { Term = state.Terms[k], Reaction = k };
        }
        _state = state;
        _includeFired = effects.IncludesFired;
        _changeStart = effects.ChangeStart;
        _changeSpecies = effects.ChangeSpecies;
    }

    /// <summary>
    /// Points broad reaction <paramref name="reaction"/>'s update range at the readers of the species it
    /// changes, each reaction once (and the reaction itself when the effects include the fired one),
    /// copied into the scratch region. Allocation-free; valid until the next call.
    /// </summary>
    public void CollectBroad(ref Header header, int reaction)
    {
        if (++_stampValue == int.MaxValue)
        {
            Array.Clear(_stamp);
            _stampValue = 1;
        }
        var stamp = _stampValue;
        var end = _scratch;
        for (var e = _changeStart[reaction]; e < _changeStart[reaction + 1]; e++)
        {
            var species = _changeSpecies[e];
            for (var u = _blockStart[species]; u < _blockStart[species + 1]; u++)
            {
                var k = _updates[u].Reaction;
                if (_stamp[k] == stamp) continue;
                _stamp[k] = stamp;
                _updates[end++] = _updates[u];
            }
        }
        if (_includeFired && _stamp[reaction] != stamp)
            _updates[end++] = new PropensityUpdate { Term = _state.Terms[reaction], Reaction = reaction };
        header.UpdateStart = _scratch;
        header.PlainEnd = _scratch;
        header.UpdateEnd = end;
    }

    /// <summary>
    /// Copies the state's constants c_j into the update records, when they changed since the last copy,
    /// and puts each reaction's plain unimolecular updates first (up to <see cref="Header.PlainEnd"/>).
    /// </summary>
    public void RefreshConstants(SimulatorState state)
    {
        if (_constantsVersion == state.ConstantsVersion) return;
        var terms = state.Terms;
        for (var u = 0; u < _updates.Length; u++) _updates[u].Term.Constant = terms[_updates[u].Reaction].Constant;
        for (var j = 0; j < _headers.Length; j++)
        {
            ref var header = ref _headers[j];
            if (header.Broad) continue; // its range is set at each firing
            var slice = _updates.AsSpan(header.UpdateStart, header.UpdateEnd - header.UpdateStart);
            var plain = 0;
            for (var u = 0; u < slice.Length; u++)
            {
                if (!IsPlain(slice[u].Term)) continue;
                (slice[plain], slice[u]) = (slice[u], slice[plain]);
                plain++;
            }
            header.PlainEnd = header.UpdateStart + plain;
        }
        _constantsVersion = state.ConstantsVersion;
    }

    /// <summary>
    /// A unimolecular term whose value c·x cannot be unusable: 0 ≤ c ≤ 10^290 and 0 ≤ x ≤ 2^62 (mass
    /// action never takes a count below 0, and counts never pass <see cref="CountLimit"/>), so c·x is
    /// finite and ≥ 0 and the inner loop need not check it.
    /// </summary>
    private static bool IsPlain(in PropensityTerm term) =>
        term.Form == PropensityForm.Unimolecular && term.Constant >= 0.0 && term.Constant <= 1e290;

    /// <summary>Reference to reaction 0's header; index with <see cref="Unsafe.Add{T}(ref T, int)"/> (indices are reactions).</summary>
    public ref Header Headers => ref MemoryMarshal.GetArrayDataReference(_headers);

    /// <summary>Reference to change 0; a header's change range indexes from here.</summary>
    public ref CountChange Changes => ref MemoryMarshal.GetArrayDataReference(_changes);

    /// <summary>Reference to update 0; a header's update range indexes from here.</summary>
    public ref PropensityUpdate Updates => ref MemoryMarshal.GetArrayDataReference(_updates);

    /// <summary>
    /// Applies reaction <paramref name="reaction"/>'s count changes to the counts whose element 0 is
    /// <paramref name="count0"/>, stopping the run before a count would pass <see cref="CountLimit"/> and
    /// after a rate law has over-consumed.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void Fire(ref Header header, int reaction, ref long count0, SimulatorState state, ReactionEffects effects, double time)
    {
        ref var change0 = ref MemoryMarshal.GetArrayDataReference(_changes);
        for (var e = header.ChangeStart; e < header.ChangeEnd; e++)
        {
            ref var change = ref Unsafe.Add(ref change0, e);
            ref var count = ref Unsafe.Add(ref count0, change.Species);
            if (count > change.Headroom) state.ThrowCountOverflow(reaction, change.Species, change.Amount, time);
            count += change.Amount;
        }
        if (header.OutOfLine) FireOutOfLine(ref header, reaction, state, effects, time);
    }

    /// <summary>The rare parts of a firing: the over-consumption check of a rate law, a broad reaction's updates.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    private void FireOutOfLine(ref Header header, int reaction, SimulatorState state, ReactionEffects effects, double time)
    {
        if (header.MakesBurst) state.FireBursts(reaction, time);
        if (header.CheckConsumption) effects.CheckFiring(reaction, state, time);
        if (header.Broad) CollectBroad(ref header, reaction);
    }

    /// <summary>One reaction's slices of the change and update lists.</summary>
    [StructLayout(LayoutKind.Sequential)]
    internal struct Header
    {
        public int ChangeStart;
        public int ChangeEnd;
        public int UpdateStart;
        public int UpdateEnd;
        /// <summary>Updates UpdateStart .. PlainEnd−1 are plain unimolecular ones: a = c·x, no check needed.</summary>
        public int PlainEnd;
        /// <summary>Either of the two below: the one test <see cref="Fire"/> makes for them.</summary>
        public bool OutOfLine;
        public bool CheckConsumption;
        /// <summary>The reaction changes a two-state species: its firing is a switch (<see cref="TransitionCounter"/>).</summary>
        public bool CountsSwitch;
        /// <summary>The reaction changes a species whose modes are watched (<see cref="ModeWatch"/>).</summary>
        public bool WatchesMode;
        /// <summary>A firing may change a state-triggered change's condition (<see cref="TriggerWatch.WatchedBy"/>).</summary>
        public bool ChecksTriggers;
        /// <summary>The update range is set at each firing by <see cref="CollectBroad"/>.</summary>
        public bool Broad;
        /// <summary>The reaction makes a burst of random size (<see cref="SimulatorState.FireBursts"/>).</summary>
        public bool MakesBurst;
    }

    /// <summary>Count of <see cref="Species"/> += <see cref="Amount"/>, allowed while the count is ≤ <see cref="Headroom"/>.</summary>
    internal struct CountChange
    {
        public long Amount;
        public long Headroom;
        public int Species;
    }

    /// <summary>Re-evaluate reaction <see cref="Reaction"/>'s propensity from <see cref="Term"/>.</summary>
    internal struct PropensityUpdate
    {
        public PropensityTerm Term;
        public int Reaction;
    }
}
