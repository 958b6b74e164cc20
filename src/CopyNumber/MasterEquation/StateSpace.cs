namespace CopyNumber.MasterEquation;

/// <summary>
/// The states of a finite state projection, numbered 0, 1, … in the order they were added. Each state
/// is stored as its <see cref="StateCoding"/> coordinates in one flat int array (state-major), and
/// found again through an open-addressing hash table (linear probing, load at most ½) over those
/// coordinates: memory is 4·dimension + 8 bytes per state at most, whatever the ranges of the counts,
/// so networks with many species cost no more than their reachable states. Adding is single-threaded;
/// once built, lookups may run on any number of threads.
/// </summary>
public sealed class StateSpace
{
    private int[] _coordinates;
    private int[] _slots; // state index + 1; 0 is empty
    private int _mask;

    /// <summary>An empty space for states coded by <paramref name="coding"/>.</summary>
    public StateSpace(StateCoding coding, int initialCapacity = 1024)
    {
        ArgumentNullException.ThrowIfNull(coding);
        Coding = coding;
        Dimension = coding.Dimension;
        var capacity = 16;
        while (capacity < 2 * initialCapacity) capacity *= 2;
        _slots = new int[capacity];
        _mask = capacity - 1;
        _coordinates = new int[Math.Max(1, initialCapacity * Math.Max(1, Dimension))];
    }

    /// <summary>How states are coded.</summary>
    public StateCoding Coding { get; }

    /// <summary>Coordinates per state.</summary>
    public int Dimension { get; }

    /// <summary>Number of states.</summary>
    public int Count { get; private set; }

    /// <summary>The coordinates of state <paramref name="state"/>.</summary>
    public ReadOnlySpan<int> Coordinates(int state) => _coordinates.AsSpan(state * Dimension, Dimension);

    /// <summary>The index of the state with coordinates <paramref name="key"/>, or −1 when it is not in the space.</summary>
    public int IndexOf(ReadOnlySpan<int> key)
    {
        var slot = (int)(Hash(key) & (uint)_mask);
        while (true)
        {
            var entry = _slots[slot];
            if (entry == 0) return -1;
            if (key.SequenceEqual(Coordinates(entry - 1))) return entry - 1;
            slot = (slot + 1) & _mask;
        }
    }

    /// <summary>Adds the state with coordinates <paramref name="key"/> unless present; returns its index and whether it is new.</summary>
    public (int Index, bool Added) Add(ReadOnlySpan<int> key)
    {
        var existing = IndexOf(key);
        if (existing >= 0) return (existing, false);
        if (2L * (Count + 1) > _slots.Length) Rehash(_slots.Length * 2);
        var needed = (long)(Count + 1) * Dimension;
        if (needed > _coordinates.Length)
        {
            var grown = Math.Max(needed, Math.Min((long)Array.MaxLength, 2L * _coordinates.Length));
            Array.Resize(ref _coordinates, (int)grown);
        }
        var index = Count++;
        key.CopyTo(_coordinates.AsSpan(index * Dimension, Dimension));
        Insert(index, key);
        return (index, true);
    }

    /// <summary>Fills the full count vector of state <paramref name="state"/> (see <see cref="StateCoding.TryDecode"/>).</summary>
    public void Counts(int state, long[] counts) => Coding.TryDecode(Coordinates(state), counts);

    private void Insert(int index, ReadOnlySpan<int> key)
    {
        var slot = (int)(Hash(key) & (uint)_mask);
        while (_slots[slot] != 0) slot = (slot + 1) & _mask;
        _slots[slot] = index + 1;
    }

    private void Rehash(int capacity)
    {
        _slots = new int[capacity];
        _mask = capacity - 1;
        for (var i = 0; i < Count; i++) Insert(i, Coordinates(i));
    }

    // A multiply–xorshift mix per coordinate (common practice, in the manner of splitmix64's finaliser):
    // neighbouring lattice points land in unrelated slots, so linear probing stays short.
    private static ulong Hash(ReadOnlySpan<int> key)
    {
        var h = 0x9E3779B97F4A7C15UL;
        foreach (var x in key)
        {
            h ^= (uint)x;
            h *= 0xBF58476D1CE4E5B9UL;
            h ^= h >> 31;
        }
        h *= 0x94D049BB133111EBUL;
        return h ^ (h >> 29);
    }
}
