namespace CopyNumber.Ensembles;

/// <summary>The two ways of looking at cells that grow and divide (docs/methods.md "Growth and division").</summary>
public enum CellView
{
    /// <summary>One lineage followed through time (a mother machine), averaged over time along it: every age of every cycle counts by its duration.</summary>
    Lineage,

    /// <summary>A snapshot of a culture in balanced exponential growth (flow cytometry): every cell alive at one instant counts once.</summary>
    Population,
}

/// <summary>An estimate with its standard error.</summary>
/// <param name="Value">The estimate.</param>
/// <param name="StandardError">Its standard error, from the spread between independent replicates.</param>
public readonly record struct Estimate(double Value, double StandardError);

/// <summary>
/// One species' law in one view, estimated from weighted records of independent replicates: the weighted
/// histogram (probability per count) and the mean, variance, CV² (variance over squared mean) and Fano factor
/// (variance over mean), each with its standard error.
/// </summary>
/// <remarks>
/// Each replicate r contributes sums W_r = Σw, A_r = Σw·x, B_r = Σw·x² over its records. The estimates are
/// ratio estimators, m = ΣA/ΣW, M₂ = ΣB/ΣW, v = M₂ − m², and their standard errors come from the replicates'
/// linearised residuals e_r (e.g. (A_r − m·W_r)/W̄ for the mean), SE² = Σe_r²/(R(R − 1)) (Cochran 1977,
/// Sampling Techniques, 3rd ed., §6.4, the ratio estimator; the delta method for v, CV² and Fano). So the
/// records of one replicate, which are correlated, enter only through their replicate's sums.
/// </remarks>
/// <param name="Species">The species' name.</param>
/// <param name="View">Which view.</param>
/// <param name="Mean">The mean count.</param>
/// <param name="Variance">The variance, copies².</param>
/// <param name="Cv2">The squared coefficient of variation.</param>
/// <param name="Fano">The Fano factor.</param>
/// <param name="Counts">The counts seen, ascending.</param>
/// <param name="Probabilities">The probability of each count.</param>
/// <param name="ProbabilityErrors">Each probability's standard error.</param>
public sealed record SnapshotLaw(
    string Species,
    CellView View,
    Estimate Mean,
    Estimate Variance,
    Estimate Cv2,
    Estimate Fano,
    long[] Counts,
    double[] Probabilities,
    double[] ProbabilityErrors);

/// <summary>
/// The population snapshot of every species beside the lineage's time average, from the same replicates
/// (<see cref="PopulationSnapshot"/>); the differences come with standard errors of their own, which take the
/// two views' correlation within a replicate into account.
/// </summary>
public sealed record SnapshotResult
{
    /// <summary>Per species, the lineage's law then the population's, in species order.</summary>
    public required IReadOnlyList<(SnapshotLaw Lineage, SnapshotLaw Population)> Species { get; init; }

    /// <summary>Per species, population mean − lineage mean.</summary>
    public required IReadOnlyList<Estimate> MeanDifference { get; init; }

    /// <summary>Per species, population variance − lineage variance.</summary>
    public required IReadOnlyList<Estimate> VarianceDifference { get; init; }

    /// <summary>
    /// Per species, the population mean over the later half of the sampled cycles minus that over the earlier half
    /// (<see cref="SettlingLimit"/> standard errors or more: the lineages had not settled after the burn-in); NaN for one sampled cycle.
    /// </summary>
    public required IReadOnlyList<Estimate> Settling { get; init; }

    /// <summary>Standard errors beyond which <see cref="Settling"/> is reported as not settled.</summary>
    public const double SettlingLimit = 4.0;

    /// <summary>The species whose <see cref="Settling"/> is resolved beyond <see cref="SettlingLimit"/> standard errors.</summary>
    public IEnumerable<(string Species, Estimate Drift)> Unsettled() =>
        Species.Select((s, i) => (s.Population.Species, Settling[i])).Where(d => Math.Abs(d.Item2.Value) > SettlingLimit * d.Item2.StandardError);

    /// <summary>Independent replicates (lineages, or pairs of lineages for a random cycle length).</summary>
    public required long Replicates { get; init; }

    /// <summary>Divisions before the first sampled cycle.</summary>
    public required int BurnIn { get; init; }

    /// <summary>Cycles sampled per lineage.</summary>
    public required int Cycles { get; init; }

    /// <summary>Records per sampled cycle.</summary>
    public required int AgesPerCycle { get; init; }

    /// <summary>The population's growth rate Λ, per model time unit.</summary>
    public required double GrowthRate { get; init; }

    /// <summary>The seed the snapshot's streams derive from.</summary>
    public required ulong Seed { get; init; }
}

/// <summary>Adds up weighted records per replicate and turns them into <see cref="SnapshotLaw"/>s.</summary>
internal sealed class SnapshotSums
{
    // Per replicate: W, A, B (see SnapshotLaw), for each (view, species).
    private readonly double[] _perReplicate;
    private readonly int _species;
    // Per replicate and species: the population view's W and A over the earlier and the later half of the cycles.
    private readonly double[] _halves;
    // Per (view, species) and count: Σ_r S_rn, Σ_r S_rn², Σ_r S_rn·W_r, S_rn the replicate's weight on count n.
    private readonly SortedDictionary<long, (double S, double S2, double SW)>[] _histograms;

    public SnapshotSums(long replicates, int species)
    {
        _species = species;
        _perReplicate = new double[replicates * 2 * species * 3];
        _halves = new double[replicates * species * 4];
        _histograms = new SortedDictionary<long, (double, double, double)>[2 * species];
        for (var h = 0; h < _histograms.Length; h++) _histograms[h] = [];
    }

    /// <summary>One replicate's records, adding its histogram terms; called in replicate order, so the sums do not depend on the threads.</summary>
    public void Add(long replicate, ReplicateRecords records)
    {
        for (var h = 0; h < _histograms.Length; h++)
        {
            var (w, a, b) = records.Sums(h);
            var at = (replicate * _histograms.Length + h) * 3;
            (_perReplicate[at], _perReplicate[at + 1], _perReplicate[at + 2]) = (w, a, b);
            if (h < _species)
            {
                var at2 = (replicate * _species + h) * 4;
                (_halves[at2], _halves[at2 + 1], _halves[at2 + 2], _halves[at2 + 3]) = records.Halves(h);
            }
            foreach (var (count, s) in records.Histogram(h))
            {
                var (s1, s2, sw) = _histograms[h].GetValueOrDefault(count);
                _histograms[h][count] = (s1 + s, s2 + s * s, sw + s * w);
            }
        }
    }

    private long Replicates => _perReplicate.Length / (_histograms.Length * 3);

    private (double W, double A, double B) Of(long replicate, int h)
    {
        var at = (replicate * _histograms.Length + h) * 3;
        return (_perReplicate[at], _perReplicate[at + 1], _perReplicate[at + 2]);
    }

    private (double Mean, double Second, double MeanWeight) Pooled(int h)
    {
        double w = 0, a = 0, b = 0;
        for (var r = 0L; r < Replicates; r++)
        {
            var (wr, ar, br) = Of(r, h);
            (w, a, b) = (w + wr, a + ar, b + br);
        }
        return (a / w, b / w, w / Replicates);
    }

    // The residuals of mean, variance, CV² and Fano of replicate r (see SnapshotLaw's remarks).
    private static (double Mean, double Variance, double Cv2, double Fano) Residuals((double W, double A, double B) r, (double Mean, double Second, double MeanWeight) p)
    {
        var v = p.Second - p.Mean * p.Mean;
        var em = (r.A - p.Mean * r.W) / p.MeanWeight;
        var ev = (r.B - p.Second * r.W) / p.MeanWeight - 2 * p.Mean * em;
        var m = p.Mean;
        return (em, ev, ev / (m * m) - 2 * v / (m * m * m) * em, ev / m - v / (m * m) * em);
    }

    private double Error(Func<long, double> residual)
    {
        var sum = 0.0;
        for (var r = 0L; r < Replicates; r++) sum += residual(r) * residual(r);
        return Replicates > 1 ? Math.Sqrt(sum / (Replicates * (double)(Replicates - 1))) : double.NaN;
    }

    /// <summary>The law of species <paramref name="species"/> in <paramref name="view"/>.</summary>
    public SnapshotLaw Law(string name, int species, CellView view)
    {
        var h = (int)view * _species + species;
        var p = Pooled(h);
        var v = p.Second - p.Mean * p.Mean;
        Estimate Estimated(double value, Func<(double Mean, double Variance, double Cv2, double Fano), double> pick) =>
            new(value, Error(r => pick(Residuals(Of(r, h), p))));
        var totalWeight = p.MeanWeight * Replicates;
        var sumW2 = 0.0;
        for (var r = 0L; r < Replicates; r++) sumW2 += Of(r, h).W * Of(r, h).W;
        var counts = _histograms[h].Keys.ToArray();
        var probabilities = new double[counts.Length];
        var errors = new double[counts.Length];
        var i = 0;
        foreach (var (s, s2, sw) in _histograms[h].Values)
        {
            var q = s / totalWeight;
            probabilities[i] = q;
            // Σ_r (S_rn − q·W_r)², expanded over the sums kept per count.
            var spread = Math.Max(0, s2 - 2 * q * sw + q * q * sumW2);
            errors[i++] = Replicates > 1 ? Math.Sqrt(spread / (Replicates * (double)(Replicates - 1))) / p.MeanWeight : double.NaN;
        }
        return new SnapshotLaw(name, view, Estimated(p.Mean, e => e.Mean), Estimated(v, e => e.Variance), Estimated(v / (p.Mean * p.Mean), e => e.Cv2),
            Estimated(v / p.Mean, e => e.Fano), counts, probabilities, errors);
    }

    /// <summary>
    /// The population view's mean over the later half of the sampled cycles minus that over the earlier half, with
    /// its error from each replicate's paired residuals: near 0 when the lineages had settled after the burn-in;
    /// NaN when there are no halves (one sampled cycle).
    /// </summary>
    public Estimate Settling(int species)
    {
        double ew = 0, ea = 0, lw = 0, la = 0;
        for (var r = 0L; r < Replicates; r++)
        {
            var at = (r * _species + species) * 4;
            (ew, ea, lw, la) = (ew + _halves[at], ea + _halves[at + 1], lw + _halves[at + 2], la + _halves[at + 3]);
        }
        if (!(ew > 0 && lw > 0)) return new Estimate(double.NaN, double.NaN);
        var (early, late) = (ea / ew, la / lw);
        var (meanEarlyW, meanLateW) = (ew / Replicates, lw / Replicates);
        return new Estimate(late - early, Error(r =>
        {
            var at = (r * _species + species) * 4;
            return (_halves[at + 3] - late * _halves[at + 2]) / meanLateW - (_halves[at + 1] - early * _halves[at]) / meanEarlyW;
        }));
    }

    /// <summary>Population minus lineage, of the mean and of the variance, with errors from the paired residuals.</summary>
    public (Estimate Mean, Estimate Variance) Difference(int species, double lineageMean, double populationMean, double lineageVariance, double populationVariance)
    {
        var (l, q) = (species, _species + species);
        var (pl, pp) = (Pooled(l), Pooled(q));
        var mean = Error(r => Residuals(Of(r, q), pp).Mean - Residuals(Of(r, l), pl).Mean);
        var variance = Error(r => Residuals(Of(r, q), pp).Variance - Residuals(Of(r, l), pl).Variance);
        return (new Estimate(populationMean - lineageMean, mean), new Estimate(populationVariance - lineageVariance, variance));
    }
}

/// <summary>One replicate's weighted records, per (view, species): the sums and the weight on each count.</summary>
internal sealed class ReplicateRecords(int species)
{
    private readonly double[] _sums = new double[2 * species * 3];
    // The population view's W and A over the earlier and the later half of the sampled cycles, per species.
    private readonly double[] _halves = new double[species * 4];
    private readonly Dictionary<long, double>[] _weights = Enumerable.Range(0, 2 * species).Select(_ => new Dictionary<long, double>()).ToArray();

    /// <summary>
    /// Adds a record with weight <paramref name="weight"/> in <paramref name="view"/>; <paramref name="late"/> says
    /// whether it is from the later half of the sampled cycles (null: there is one cycle, no halves).
    /// </summary>
    public void Add(CellView view, long[] counts, double weight, bool? late)
    {
        for (var s = 0; s < species; s++)
        {
            if (view == CellView.Population && late is { } half)
            {
                _halves[4 * s + (half ? 2 : 0)] += weight;
                _halves[4 * s + (half ? 3 : 1)] += weight * counts[s];
            }
            var h = (int)view * species + s;
            double x = counts[s];
            _sums[3 * h] += weight;
            _sums[3 * h + 1] += weight * x;
            _sums[3 * h + 2] += weight * x * x;
            _weights[h][counts[s]] = _weights[h].GetValueOrDefault(counts[s]) + weight;
        }
    }

    public (double W, double A, double B) Sums(int h) => (_sums[3 * h], _sums[3 * h + 1], _sums[3 * h + 2]);

    public (double EarlyW, double EarlyA, double LateW, double LateA) Halves(int species) =>
        (_halves[4 * species], _halves[4 * species + 1], _halves[4 * species + 2], _halves[4 * species + 3]);

    public IEnumerable<KeyValuePair<long, double>> Histogram(int h) => _weights[h];
}
