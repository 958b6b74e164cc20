using CopyNumber.Deterministic;
using CopyNumber.Network;

namespace CopyNumber.Analysis;

/// <summary>
/// The rate-equation solution φ(t) with its linear-noise covariance C(t) and, when computed, the
/// first-order mean correction δ(t), on a time grid. Columns are the species then the readouts, in
/// declaration order, as in <see cref="DeterministicSolution"/>. All values are in copy numbers (copies²
/// for variances and covariances); readouts in their own units.
/// </summary>
public sealed class SystemSizeExpansionSolution
{
    private readonly double[][] _states;
    private readonly double[,] _rateEquations, _variances, _correctedMeans;
    private readonly int _speciesCount, _correctionOffset;

    internal SystemSizeExpansionSolution(
        TimeGrid grid, IReadOnlyList<string> columns, int speciesCount, double[][] states, int correctionOffset,
        double[,] rateEquations, double[,] variances, double[,] correctedMeans, bool hasCorrection, OdeStatistics statistics)
    {
        Grid = grid;
        Columns = columns.ToArray();
        _speciesCount = speciesCount;
        _states = states;
        _correctionOffset = correctionOffset;
        _rateEquations = rateEquations;
        _variances = variances;
        _correctedMeans = correctedMeans;
        HasMeanCorrection = hasCorrection;
        Statistics = statistics;
    }

    /// <summary>
    /// The time of the first state-triggered change, where the expansion stops (its fluctuations would
    /// cross the jump by no rule of theirs); +∞ when it covers the whole grid. Every value at a grid time
    /// at or after it is NaN.
    /// </summary>
    public double StoppedAt { get; init; } = double.PositiveInfinity;

    /// <summary>The change line that stopped the expansion (<see cref="StoppedAt"/>), or null.</summary>
    public StateTrigger? StoppedBy { get; init; }

    /// <summary>
    /// The variance split into the part fed by the reactions and the part fed by partitioning at divisions, when it was
    /// asked for (<see cref="LinearNoiseApproximation.SolveBySource"/>); null otherwise.
    /// </summary>
    public Noise.LnaNoiseSources? Sources { get; init; }

    /// <summary>The recording times.</summary>
    public TimeGrid Grid { get; }

    /// <summary>Column names: the species, then the readouts.</summary>
    public IReadOnlyList<string> Columns { get; }

    /// <summary>How many leading columns are species.</summary>
    public int SpeciesCount => _speciesCount;

    /// <summary>True when the mean correction δ was integrated (<see cref="EffectiveMesoscopicRateEquations"/>).</summary>
    public bool HasMeanCorrection { get; }

    /// <summary>Work counters of the integration of the augmented system.</summary>
    public OdeStatistics Statistics { get; }

    /// <summary>The rate-equation value φ (species) or g(φ) (readouts) at a grid point.</summary>
    public double RateEquationValue(int point, int column) => _rateEquations[point, column];

    /// <summary>The linear-noise variance: C_ii for a species, gᵀ·C·g for a readout with gradient g at φ.</summary>
    public double Variance(int point, int column) => _variances[point, column];

    /// <summary>
    /// The corrected mean φ + δ (species) or g(φ) + ∇g·δ + ½·Σ ∂²g·C (readouts); NaN when
    /// <see cref="HasMeanCorrection"/> is false.
    /// </summary>
    public double CorrectedMean(int point, int column) => _correctedMeans[point, column];

    /// <summary>The full species covariance matrix C at a grid point (a new S × S array), copies².</summary>
    public double[,] Covariance(int point)
    {
        var s = _speciesCount;
        var c = new double[s, s];
        var p = s;
        for (var i = 0; i < s; i++)
            for (var j = i; j < s; j++, p++)
                c[i, j] = c[j, i] = _states[point][p];
        return c;
    }

    /// <summary>The mean correction δ of the species at a grid point (a new array), copies; NaN entries without the correction.</summary>
    public double[] MeanCorrection(int point)
    {
        if (!HasMeanCorrection) return Enumerable.Repeat(double.NaN, _speciesCount).ToArray();
        return _states[point].AsSpan(_correctionOffset, _speciesCount).ToArray();
    }

    /// <summary>Index of a column by name, or −1.</summary>
    public int ColumnIndex(string name)
    {
        for (var c = 0; c < Columns.Count; c++) if (Columns[c] == name) return c;
        return -1;
    }

    /// <summary>One column of <see cref="RateEquationValue"/> over the grid.</summary>
    public double[] RateEquationColumn(int column) => Column(_rateEquations, column);

    /// <summary>One column of <see cref="Variance"/> over the grid.</summary>
    public double[] VarianceColumn(int column) => Column(_variances, column);

    /// <summary>One column of <see cref="CorrectedMean"/> over the grid.</summary>
    public double[] CorrectedMeanColumn(int column) => Column(_correctedMeans, column);

    private double[] Column(double[,] values, int column)
    {
        var result = new double[Grid.Count];
        for (var k = 0; k < result.Length; k++) result[k] = values[k, column];
        return result;
    }
}
