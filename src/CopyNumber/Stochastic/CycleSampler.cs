using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>Receives a lineage's state at the ages a <see cref="CycleSampler"/> chose.</summary>
internal interface ICycleRecord
{
    /// <summary>The state at age <paramref name="age"/> of sampled cycle <paramref name="cycle"/> (0 = the first after the burn-in), whose length is <paramref name="length"/>; <paramref name="counts"/> is reused.</summary>
    void Record(int cycle, double age, double length, long[] counts);
}

/// <summary>
/// Reads one lineage at random ages of its cycles, for the population snapshot (docs/methods.md "Growth and
/// division"): after <see cref="BurnIn"/> divisions, in each of the next <see cref="Cycles"/> cycles, at
/// <see cref="AgesPerCycle"/> ages stratified over the cycle (age (j + U_j)·τ/m in stratum j, U_j uniform), so
/// each record's age is uniform on [0, τ) and the cycle's records cover it evenly. The lineage stops after the
/// last record. Which cycles are read is fixed in advance, never chosen by their lengths, so the records are
/// not length-biased. The ages come from a stream of their own, seeded by the caller.
/// </summary>
internal sealed class CycleSampler(int burnIn, int cycles, int agesPerCycle)
{
    private readonly double[] _ages = new double[agesPerCycle];
    private Xoshiro256StarStar _stream;
    private ICycleRecord? _sink;
    private int _cycle;
    private int _next;
    private double _birth;
    private double _length;

    /// <summary>Divisions before the first sampled cycle.</summary>
    public int BurnIn => burnIn;

    /// <summary>Cycles sampled per lineage.</summary>
    public int Cycles => cycles;

    /// <summary>Records per sampled cycle.</summary>
    public int AgesPerCycle => agesPerCycle;

    /// <summary>The time of the next record; +∞ while the lineage is in its burn-in.</summary>
    public double NextTime { get; private set; } = double.PositiveInfinity;

    /// <summary>True once the last cycle's records are taken.</summary>
    public bool Done { get; private set; }

    /// <summary>Starts a lineage: the ages' stream, the sink, and nothing recorded yet.</summary>
    public void Start(ulong seed, ICycleRecord sink)
    {
        _stream = new Xoshiro256StarStar(seed);
        _sink = sink;
        Done = false;
        NextTime = double.PositiveInfinity;
    }

    /// <summary>A cycle began: cycle <paramref name="index"/> (0 for the first cell) at time <paramref name="birth"/>, of length <paramref name="length"/>.</summary>
    public void NewCycle(long index, double birth, double length)
    {
        _cycle = (int)(index - burnIn);
        if (_cycle < 0 || _cycle >= cycles)
        {
            NextTime = double.PositiveInfinity;
            return;
        }
        (_birth, _length, _next) = (birth, length, 0);
        for (var j = 0; j < _ages.Length; j++) _ages[j] = (j + _stream.NextDouble()) * length / _ages.Length;
        NextTime = birth + _ages[0];
    }

    /// <summary>Hands the state at <see cref="NextTime"/> to the sink and moves to the next age.</summary>
    public void Take(long[] counts)
    {
        _sink!.Record(_cycle, _ages[_next], _length, counts);
        _next++;
        if (_next < _ages.Length)
        {
            NextTime = _birth + _ages[_next];
            return;
        }
        NextTime = double.PositiveInfinity;
        Done = _cycle == cycles - 1;
    }
}
