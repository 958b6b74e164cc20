using System.Runtime.CompilerServices;

namespace CopyNumber.Stochastic;

/// <summary>
/// A binary min-heap of the items 0 … n−1 keyed by a double, with each item's heap position indexed so a
/// key can be changed in O(log n) — the indexed priority queue of the next reaction method (Gibson &amp;
/// Bruck 2000, J. Phys. Chem. A 104:1876, §4), keyed there by the putative reaction times.
/// </summary>
internal sealed class IndexedPriorityQueue
{
    private readonly int[] _heap;     // heap slot -> item
    private readonly int[] _slotOf;   // item -> heap slot
    private readonly double[] _key;   // item -> key

    public IndexedPriorityQueue(int items)
    {
        _heap = new int[items];
        _slotOf = new int[items];
        _key = new double[items];
    }

    /// <summary>Number of items.</summary>
    public int Count => _heap.Length;

    /// <summary>The item with the smallest key (undefined when empty).</summary>
    public int Top
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => _heap[0];
    }

    /// <summary>The smallest key; +∞ when the queue is empty.</summary>
    public double TopKey
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => _heap.Length == 0 ? double.PositiveInfinity : _key[_heap[0]];
    }

    /// <summary>The key of <paramref name="item"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double Key(int item) => _key[item];

    /// <summary>Sets every key at once and rebuilds the heap in O(n).</summary>
    public void Build(ReadOnlySpan<double> keys)
    {
        keys.CopyTo(_key);
        for (var i = 0; i < _heap.Length; i++)
        {
            _heap[i] = i;
            _slotOf[i] = i;
        }
        for (var slot = _heap.Length / 2 - 1; slot >= 0; slot--) SiftDown(slot);
    }

    /// <summary>Changes the key of <paramref name="item"/> and restores heap order.</summary>
    public void Update(int item, double key)
    {
        var old = _key[item];
        _key[item] = key;
        if (key < old) SiftUp(_slotOf[item]);
        else if (key > old) SiftDown(_slotOf[item]);
    }

    private void SiftUp(int slot)
    {
        var item = _heap[slot];
        var key = _key[item];
        while (slot > 0)
        {
            var parent = (slot - 1) >> 1;
            var parentItem = _heap[parent];
            if (!(key < _key[parentItem])) break;
            Place(parentItem, slot);
            slot = parent;
        }
        Place(item, slot);
    }

    private void SiftDown(int slot)
    {
        var n = _heap.Length;
        var item = _heap[slot];
        var key = _key[item];
        while (true)
        {
            var child = 2 * slot + 1;
            if (child >= n) break;
            var childItem = _heap[child];
            var childKey = _key[childItem];
            var right = child + 1;
            if (right < n)
            {
                var rightItem = _heap[right];
                var rightKey = _key[rightItem];
                if (rightKey < childKey)
                {
                    child = right;
                    childItem = rightItem;
                    childKey = rightKey;
                }
            }
            if (!(childKey < key)) break;
            Place(childItem, slot);
            slot = child;
        }
        Place(item, slot);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private void Place(int item, int slot)
    {
        _heap[slot] = item;
        _slotOf[item] = slot;
    }
}
