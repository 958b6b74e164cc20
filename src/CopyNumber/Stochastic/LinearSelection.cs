using System.Runtime.CompilerServices;
using CopyNumber.Randomness;
using System.Runtime.InteropServices;

namespace CopyNumber.Stochastic;

/// <summary>
/// Selection by a linear walk through the cumulative sums, the direct method as Gillespie (1977) wrote
/// it; the fastest choice for the few tens of reactions of most models. The total is kept by adding each
/// change (new − old), which drifts by round-off, so it is re-summed from scratch every
/// <see cref="ResumEvery"/> events and whenever it has fallen below 10⁻⁶ of its largest value since
/// the last re-sum (the point where the accumulated error, ~10⁻¹³ of that largest value, could matter,
/// e.g. when every propensity has returned to 0).
/// </summary>
internal struct LinearSelection : IReactionSelection<LinearSelection>
{
    internal const int ResumEvery = 1024;
    internal const double CancellationFloor = 1e-6;

    // Internal, not private: the loop compiled for a network (Compiled/DirectLoopCompiler) keeps these in
    // locals and must load and store them.
    internal double[] _values;
    internal double _total;
    internal double _peak;
    internal int _untilResum;

    public static LinearSelection Create(int reactions) =>
        new() { _values = new double[reactions], _untilResum = ResumEvery };

    public readonly double Total
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => _total;
    }

    public readonly ReadOnlySpan<double> Propensities => _values;

    /// <remarks>No bounds check: the simulators pass only reaction indices validated when their programs were built.</remarks>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void Set(int reaction, double propensity)
    {
        ref var slot = ref Unsafe.Add(ref MemoryMarshal.GetArrayDataReference(_values), reaction);
        _total += propensity - slot;
        slot = propensity;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public readonly double Replace(int reaction, double propensity)
    {
        ref var slot = ref Unsafe.Add(ref MemoryMarshal.GetArrayDataReference(_values), reaction);
        var change = propensity - slot;
        slot = propensity;
        return change;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void AddToTotal(double change) => _total += change;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public readonly int Select(double point, ref Xoshiro256StarStar rng) => Select(point);

    /// <summary>The reaction whose cumulative interval holds <paramref name="point"/>; needs no further random numbers.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public readonly int Select(double point)
    {
        var values = _values;
        for (var j = 0; j < values.Length; j++)
        {
            point -= values[j];
            if (point < 0.0) return j;
        }
        return LastPositive(values);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void EndEvent()
    {
        if (_total > _peak) _peak = _total;
        if (--_untilResum == 0 || _total < _peak * CancellationFloor) Resum();
    }

    /// <remarks>Nothing to forget: every propensity is set again in reaction order and a0 re-summed from them at a replicate's start.</remarks>
    public readonly void Restart()
    {
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void Resum()
    {
        _total = Sum(_values);
        _peak = _total;
        _untilResum = ResumEvery;
    }

    // The out-of-line helpers are static on the array: an instance call would take the struct's address
    // and stop the JIT from keeping the simulator's local copy in registers.
    [MethodImpl(MethodImplOptions.NoInlining)]
    private static double Sum(double[] values)
    {
        var sum = 0.0;
        foreach (var v in values) sum += v;
        return sum;
    }

    /// <summary>When round-off leaves the point past the last interval, the last reaction that can fire.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    private static int LastPositive(double[] values)
    {
        for (var j = values.Length - 1; j >= 0; j--)
            if (values[j] > 0.0) return j;
        throw new InvalidOperationException("selection with every propensity 0");
    }
}
