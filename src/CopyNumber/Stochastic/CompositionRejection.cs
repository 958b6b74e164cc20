using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>
/// Composition–rejection selection (Slepoy, Thompson &amp; Plimpton 2008, J. Chem. Phys. 128:205101): the
/// propensities are grouped by powers of two, group g holding the a_j in [2^g, 2^(g+1)); a group is chosen
/// with probability (group sum)/a0 by a linear search over the few occupied groups (composition), then a
/// member by rejection: a uniform member j is accepted with probability a_j/2^(g+1) ≥ 1/2. Exact; the cost
/// of a selection does not grow with the number of reactions M, only with the number of occupied groups
/// (about log2 of the ratio of the largest to the smallest positive propensity), and an update moves one
/// reaction between groups in O(1).
/// </summary>
/// <remarks>
/// Groups are indexed by the biased exponent of the double (0 … 2046), so the group of a value costs one
/// shift; group 0 holds the subnormals below 2^−1022, with the bound 2^−1022. The occupied range
/// [low, high] is searched from the top, where the large sums are. Group sums and a0 are kept by adding
/// each change and so drift by round-off: they are re-summed from the members every max(1024, M) events
/// (O(1) per event amortised) and whenever a0 falls below 10⁻⁶ of its peak since the last re-sum, as in
/// <see cref="LinearSelection"/>. A member list grows by doubling when a group first holds more reactions
/// than ever before; after that nothing is allocated.
/// </remarks>
internal struct CompositionRejection : IReactionSelection<CompositionRejection>
{
    private const int Groups = 2047;
    private const int MinimumResumEvery = 1024;
    private const double CancellationFloor = 1e-6;

    // a_j and its group (−1 while a_j = 0) side by side, so an update of a large network touches one cache
    // line for them; the entry's other half carries what the packed loop needs to evaluate a_j
    // (Locality/PackedCompositionRejection) and is unused otherwise. The position in the group's member
    // list is needed only when a reaction changes group, and lives apart so an entry stays 32 bytes.
    private Entry[] _entries;
    private int[] _slots;
    private double[] _groupSum;
    private int[] _groupCount;
    private int[][] _members;
    private double _total;
    private double _peak;
    private int _high;             // highest occupied group, or −1 when none is
    private int _low;              // lowest occupied group, or Groups when none is
    private int _untilResum;
    private int _resumEvery;

    public static CompositionRejection Create(int reactions)
    {
        var selection = new CompositionRejection
        {
            // Pinned (on the pinned object heap) so the packed loop may prefetch entries by address.
            _entries = GC.AllocateArray<Entry>(reactions, pinned: true),
            _slots = new int[reactions],
            _groupSum = new double[Groups],
            _groupCount = new int[Groups],
            _members = new int[Groups][],
            _high = -1,
            _low = Groups,
            _resumEvery = Math.Max(MinimumResumEvery, reactions),
        };
        Array.Fill(selection._entries, new Entry { Group = -1 });
        selection._untilResum = selection._resumEvery;
        return selection;
    }

    public readonly double Total
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => _total;
    }

    /// <remarks>Allocates; for messages only.</remarks>
    public readonly ReadOnlySpan<double> Propensities => _entries.Select(e => e.Value).ToArray();

    /// <summary>The group of a positive finite value: its biased binary exponent.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static int GroupOf(double value) => (int)(BitConverter.DoubleToUInt64Bits(value) >> 52);

    /// <summary>2^(g+1) in the biased exponent's terms: every value of group g is below it.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double BoundOf(int group) => BitConverter.UInt64BitsToDouble((ulong)(group + 1) << 52);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void Set(int reaction, double propensity) => _total += Replace(reaction, propensity);

    /// <remarks>No bounds check on <paramref name="reaction"/>: the simulators pass only validated indices.</remarks>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double Replace(int reaction, double propensity)
    {
        ref var entry = ref Unsafe.Add(ref MemoryMarshal.GetArrayDataReference(_entries), reaction);
        var old = entry.Value;
        entry.Value = propensity;
        var target = propensity > 0.0 ? GroupOf(propensity) : -1;
        if (target == entry.Group)
        {
            if (target >= 0) Unsafe.Add(ref MemoryMarshal.GetArrayDataReference(_groupSum), target) += propensity - old;
        }
        else Move(reaction, old, propensity, target);
        return propensity - old;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void AddToTotal(double change) => _total += change;

    /// <summary>Takes the reaction out of its old group (if any) and into <paramref name="target"/> (if ≥ 0).</summary>
    private void Move(int reaction, double old, double propensity, int target)
    {
        ref var entry = ref _entries[reaction];
        var source = entry.Group;
        if (source >= 0)
        {
            var members = _members[source];
            var last = --_groupCount[source];
            var slot = _slots[reaction];
            var moved = members[last];
            members[slot] = moved;
            _slots[moved] = slot;
            if (last == 0)
            {
                _groupSum[source] = 0.0;
                if (source == _high || source == _low) ShrinkRange();
            }
            else _groupSum[source] -= old;
        }
        entry.Group = target;
        if (target < 0) return;
        var list = _members[target];
        var count = _groupCount[target];
        if (list is null || count == list.Length)
        {
            Array.Resize(ref list, Math.Max(16, 2 * count));
            _members[target] = list;
        }
        list[count] = reaction;
        _slots[reaction] = count;
        _groupCount[target] = count + 1;
        _groupSum[target] += propensity;
        if (target > _high) _high = target;
        if (target < _low) _low = target;
    }

    private void ShrinkRange()
    {
        while (_high >= 0 && _groupCount[_high] == 0) _high--;
        if (_high < 0)
        {
            _low = Groups;
            return;
        }
        while (_groupCount[_low] == 0) _low++;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public readonly int Select(double point, ref Xoshiro256StarStar rng)
    {
        // Composition: the occupied group whose cumulative interval holds the point, from the top. Empty
        // groups inside the range have sum 0 and are passed over; round-off past the end takes the lowest.
        ref var sum0 = ref MemoryMarshal.GetArrayDataReference(_groupSum);
        var group = _high;
        for (; group > _low; group--)
        {
            var sum = Unsafe.Add(ref sum0, group);
            if (point < sum) break;
            point -= sum;
        }
        return PickInGroup(group, ref rng);
    }

    /// <summary>Rejection within a group: a uniform member j is kept with probability a_j / 2^(g+1).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private readonly int PickInGroup(int group, ref Xoshiro256StarStar rng)
    {
        var members = _members[group];
        var count = (ulong)_groupCount[group];
        var bound = BoundOf(group);
        ref var entry0 = ref MemoryMarshal.GetArrayDataReference(_entries);
        ref var member0 = ref MemoryMarshal.GetArrayDataReference(members);
        while (true)
        {
            // The high 64 bits of a 64 × 64-bit product: a uniform index with bias below count/2^64 (Lemire 2019,
            // ACM Trans. Model. Comput. Simul. 29:3).
            var index = (int)Math.BigMul(rng.NextUInt64(), count, out _);
            var reaction = Unsafe.Add(ref member0, index);
            if (rng.NextDouble() * bound < Unsafe.Add(ref entry0, reaction).Value) return reaction;
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void EndEvent()
    {
        if (_total > _peak) _peak = _total;
        if (--_untilResum == 0 || _total < _peak * CancellationFloor) Resum();
    }

    /// <remarks>
    /// The member lists are the history here: a reaction's slot depends on when it last changed group, and
    /// the rejection step picks a member by slot. Emptied (allocation kept), the lists are rebuilt by the
    /// replicate's own updates; an entry's packed-loop half is kept.
    /// </remarks>
    public void Restart()
    {
        for (var j = 0; j < _entries.Length; j++)
        {
            _entries[j].Value = 0.0;
            _entries[j].Group = -1;
        }
        Array.Clear(_groupCount);
        Array.Clear(_groupSum);
        _high = -1;
        _low = Groups;
        _total = 0.0;
        _peak = 0.0;
        _untilResum = _resumEvery;
    }

    public void Resum()
    {
        var total = 0.0;
        for (var g = _low; g <= _high; g++)
        {
            var sum = 0.0;
            var members = _members[g];
            for (var i = 0; i < _groupCount[g]; i++) sum += _entries[members[i]].Value;
            _groupSum[g] = sum;
            total += sum;
        }
        _total = total;
        _peak = total;
        _untilResum = _resumEvery;
    }

    /// <summary>Reference to reaction 0's entry, for the packed loop, which keeps its terms in the entries.</summary>
    internal readonly ref Entry Entries => ref MemoryMarshal.GetArrayDataReference(_entries);

    /// <summary>
    /// A reaction's propensity and group, and (for the packed loop only) its propensity term and the offset of
    /// its firing program: what one propensity update reads and writes, in 32 bytes, two to a cache line.
    /// </summary>
    [StructLayout(LayoutKind.Sequential)]
    internal struct Entry
    {
        /// <summary>a_j, events per unit time.</summary>
        public double Value;
        /// <summary>c_j (packed loop only).</summary>
        public double Constant;
        /// <summary>The first and second reactant species, in the packed loop's numbering (packed loop only).</summary>
        public int SpeciesA;
        public int SpeciesB;
        /// <summary>The group (biased exponent of a_j), −1 while a_j = 0.</summary>
        public int Group;
        /// <summary>The propensity's form in the low 3 bits, the firing program's offset above them (packed loop only).</summary>
        public int FormAndProgram;
    }
}
