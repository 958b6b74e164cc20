using CopyNumber.Deterministic;
using CopyNumber.Network;

namespace CopyNumber.Analysis;

/// <summary>
/// The rate equations augmented with the linear noise approximation's covariance and, optionally, the
/// first-order mean correction, as one <see cref="IOdeSystem"/> (docs/methods-analysis.md):
/// <code>
/// dφ/dt = N·v(φ)
/// dC/dt = J·C + C·Jᵀ + N·diag(v(φ))·Nᵀ                     (van Kampen 2007, ch. X; Elf &amp; Ehrenberg 2003)
/// dδ/dt = J_a·δ + N·[(a − v)(φ) + ½·Σ_kl ∂²a/∂x_k∂x_l·C_kl]  (Grima 2010, J. Chem. Phys. 133:035101)
/// </code>
/// in copy numbers. The state is φ (species order), then the upper triangle of C row by row
/// (C_00, C_01, …, C_0,S−1, C_11, …), then δ when the correction is on, then, when the sources are split,
/// two more packed covariances of the same form: C_r, fed by the reactions' noise N·diag(v)·Nᵀ (and the
/// bursts'), and C_p, fed by nothing between jumps (the partitioning variance enters it at divisions,
/// <see cref="ExpansionIntegration"/>). The equation is linear in C and its source, so C = C_r + C_p
/// whenever C(0) = 0 (docs/methods-analysis.md §1, "Noise by source"). Holds its own parameter values
/// and constants, so schedule changes affect only this instance; one instance per integration.
/// </summary>
internal sealed class ExpansionSystem : IOdeSystem
{
    private readonly ReactionNetwork _network;
    private readonly Stoichiometry _n;
    private readonly int _s, _packed;
    private readonly double[] _parameters, _constants, _rates, _phi;
    private readonly double[,] _dvdx, _jacobian, _covariance, _block;
    private readonly PropensityExpansion? _expansion;
    private readonly double[] _excess = [], _curvature = [], _shifted = [], _plus = [], _minus = [];
    private readonly double[,] _gradient = new double[0, 0], _meanJacobian = new double[0, 0];

    /// <summary>The network integrated.</summary>
    public ReactionNetwork Network => _network;

    public ExpansionSystem(ReactionNetwork network, bool withMeanCorrection, bool splitSources = false)
    {
        _network = network;
        _n = network.Stoichiometry;
        _s = network.Species.Count;
        _packed = _s * (_s + 1) / 2;
        var m = network.Reactions.Count;
        _parameters = network.ParameterValuesWithTime();
        _constants = new double[m];
        _rates = new double[m];
        _phi = new double[_s];
        _dvdx = new double[m, _s];
        _jacobian = new double[_s, _s];
        _covariance = new double[_s, _s];
        _block = new double[_s, _s];
        network.Propensities.ComputeConstants(_parameters, _constants);
        WithMeanCorrection = withMeanCorrection;
        SplitsSources = splitSources;
        Dimension = _s + _packed + (withMeanCorrection ? _s : 0) + (splitSources ? 2 * _packed : 0);
        _shifted = new double[Dimension];
        _plus = new double[Dimension];
        _minus = new double[Dimension];
        if (!withMeanCorrection) return;
        _expansion = new PropensityExpansion(network);
        _excess = new double[m];
        _curvature = new double[m];
        _gradient = new double[m, _s];
        _meanJacobian = new double[_s, _s];
    }

    /// <inheritdoc/>
    public int Dimension { get; }

    /// <summary>True unless a rate law reads <c>time</c>.</summary>
    public bool IsAutonomous => !_network.TimeDependence.Any;

    /// <summary>True when δ is part of the state.</summary>
    public bool WithMeanCorrection { get; }

    /// <summary>True when the covariance fed by the reactions and the one fed by partitioning are integrated beside C.</summary>
    public bool SplitsSources { get; }

    /// <summary>Offsets of the packed covariances in the state: C, then C_r and C_p when the sources are split.</summary>
    public IReadOnlyList<int> CovarianceBlocks => SplitsSources ? [CovarianceOffset, ReactionsOffset, PartitioningOffset] : [CovarianceOffset];

    /// <summary>Offset of C_r, the covariance fed by the reactions (meaningful only when the sources are split).</summary>
    public int ReactionsOffset => _s + _packed + (WithMeanCorrection ? _s : 0);

    /// <summary>Offset of C_p, the covariance fed by partitioning at divisions (meaningful only when the sources are split).</summary>
    public int PartitioningOffset => ReactionsOffset + _packed;

    /// <summary>Number of species S.</summary>
    public int SpeciesCount => _s;

    /// <summary>Offset of the packed covariance in the state.</summary>
    public int CovarianceOffset => _s;

    /// <summary>Offset of δ in the state (meaningful only with the correction on).</summary>
    public int CorrectionOffset => _s + _packed;

    /// <summary>The parameter values in force; change them with <see cref="SetParameter"/>.</summary>
    public double[] ParameterArray => _parameters;

    /// <summary>Sets a parameter and recomputes the mass-action constants.</summary>
    public void SetParameter(int index, double value)
    {
        _parameters[index] = value;
        _network.Propensities.ComputeConstants(_parameters, _constants);
    }

    /// <summary>Position of C_ij (any order of i, j) in the state: after φ, in the packed upper triangle.</summary>
    public int Packed(int i, int j)
    {
        if (i > j) (i, j) = (j, i);
        return _s + i * _s - i * (i - 1) / 2 + (j - i);
    }

    /// <summary>Reads the full symmetric C (or the block at <paramref name="offset"/>) from a state.</summary>
    public void UnpackCovariance(ReadOnlySpan<double> y, double[,] covariance, int offset = -1)
    {
        var p = offset < 0 ? _s : offset;
        for (var i = 0; i < _s; i++)
            for (var j = i; j < _s; j++, p++)
                covariance[i, j] = covariance[j, i] = y[p];
    }

    /// <summary>Writes a symmetric C (upper triangle read) into a state, at the block <paramref name="offset"/> (C by default).</summary>
    public void PackCovariance(double[,] covariance, Span<double> y, int offset = -1)
    {
        var p = offset < 0 ? _s : offset;
        for (var i = 0; i < _s; i++)
            for (var j = i; j < _s; j++, p++)
                y[p] = covariance[i, j];
    }

    /// <inheritdoc/>
    public void Derivative(double t, double[] y, double[] dydt)
    {
        _parameters[_network.TimeSlot] = t;
        Array.Copy(y, _phi, _s);
        var rateEquations = _network.RateEquations;
        rateEquations.Rates(_phi, _constants, _parameters, _rates);
        rateEquations.Jacobian(_phi, _constants, _parameters, _dvdx, _jacobian);
        UnpackCovariance(y, _covariance);

        Array.Clear(dydt);
        for (var r = 0; r < _rates.Length; r++)
        {
            var species = _n.ChangedSpecies(r);
            var change = _n.Changes(r);
            for (var e = 0; e < species.Length; e++) dydt[species[e]] += change[e] * _rates[r];
            // N·diag(v)·Nᵀ; a rate that round-off pushed below zero adds no noise rather than negative noise.
            var noise = Math.Max(_rates[r], 0.0);
            if (noise == 0) continue;
            for (var e = 0; e < species.Length; e++)
                for (var f = e; f < species.Length; f++)
                    dydt[Packed(species[e], species[f])] += change[e] * change[f] * noise;
        }
        AddBursts(dydt);
        // C_r gets the same noise as C; C_p none between divisions.
        if (SplitsSources) Array.Copy(dydt, _s, dydt, ReactionsOffset, _packed);
        AddLinear(_s, dydt);
        if (SplitsSources)
        {
            UnpackCovariance(y, _block, ReactionsOffset);
            AddLinear(ReactionsOffset, dydt, _block);
            UnpackCovariance(y, _block, PartitioningOffset);
            AddLinear(PartitioningOffset, dydt, _block);
        }

        if (!WithMeanCorrection) return;
        _expansion!.Expand(_phi, _rates, _constants, _parameters, _excess, _gradient);
        _expansion.Curvature(_covariance, _curvature);
        MeanJacobian();
        var offset = CorrectionOffset;
        for (var i = 0; i < _s; i++)
        {
            var sum = 0.0;
            for (var k = 0; k < _s; k++) sum += _meanJacobian[i, k] * y[offset + k];
            dydt[offset + i] = sum;
        }
        for (var r = 0; r < _rates.Length; r++)
        {
            var source = _excess[r] + _curvature[r];
            if (source == 0) continue;
            var species = _n.ChangedSpecies(r);
            var change = _n.Changes(r);
            for (var e = 0; e < species.Length; e++) dydt[offset + species[e]] += change[e] * source;
        }
        foreach (var burst in _network.Bursts.All)
            dydt[offset + burst.Species] += (burst.Mean([], _parameters) - 1) * (_excess[burst.Reaction] + _curvature[burst.Reaction]);
    }

    // J·C + C·Jᵀ added to the packed block at `offset` (C itself unless another block is given).
    private void AddLinear(int offset, double[] dydt, double[,]? block = null)
    {
        var c = block ?? _covariance;
        var p = offset;
        for (var i = 0; i < _s; i++)
            for (var j = i; j < _s; j++, p++)
            {
                var sum = 0.0;
                for (var m = 0; m < _s; m++) sum += _jacobian[i, m] * c[m, j] + _jacobian[j, m] * c[i, m];
                dydt[p] += sum;
            }
    }

    /// <summary>
    /// The bursts' share of the drift and the noise. A burst's jump is ν + (B − 1)·e_i, ν the N column (which
    /// holds +1 for the burst) and B geometric of mean b (<see cref="BurstProducts"/>): the drift gains
    /// (b − 1)·v, and E[jump·jumpᵀ] = ννᵀ + (b − 1)(ν·e_iᵀ + e_i·νᵀ) + E[(B − 1)²]·e_i·e_iᵀ with
    /// E[(B − 1)²] = b(1 + b) + (b − 1)², the second moment the linear noise approximation needs.
    /// </summary>
    private void AddBursts(double[] dydt)
    {
        foreach (var burst in _network.Bursts.All)
        {
            var b = burst.Mean([], _parameters);
            var v = _rates[burst.Reaction];
            var i = burst.Species;
            dydt[i] += (b - 1) * v;
            var noise = Math.Max(v, 0.0);
            if (noise == 0) continue;
            var species = _n.ChangedSpecies(burst.Reaction);
            var change = _n.Changes(burst.Reaction);
            for (var e = 0; e < species.Length; e++)
                dydt[Packed(species[e], i)] += (species[e] == i ? 2 : 1) * (b - 1) * change[e] * noise;
            dydt[Packed(i, i)] += (b * (1 + b) + (b - 1) * (b - 1)) * noise;
        }
    }

    // J_a = N·∂a/∂x from the gradient of the last expansion.
    private void MeanJacobian()
    {
        Array.Clear(_meanJacobian);
        for (var r = 0; r < _rates.Length; r++)
        {
            var species = _n.ChangedSpecies(r);
            var change = _n.Changes(r);
            for (var e = 0; e < species.Length; e++)
                for (var k = 0; k < _s; k++)
                    _meanJacobian[species[e], k] += change[e] * _gradient[r, k];
        }
        foreach (var burst in _network.Bursts.All)
        {
            var extra = burst.Mean([], _parameters) - 1;
            for (var k = 0; k < _s; k++) _meanJacobian[burst.Species, k] += extra * _gradient[burst.Reaction, k];
        }
    }

    /// <summary>
    /// The Jacobian: exact for the blocks that are linear in C and δ (and for ∂(dφ)/∂φ = J); the
    /// columns for φ of the C and δ rows, which hold derivatives of J and of the Hessians, by central
    /// differences of <see cref="Derivative"/>.
    /// </summary>
    public void Jacobian(double t, double[] y, double[,] jacobian)
    {
        Array.Clear(jacobian);
        Array.Copy(y, _shifted, y.Length);
        for (var k = 0; k < _s; k++)
        {
            var h = CentralDifferences.Step(y[k]);
            _shifted[k] = y[k] + h;
            Derivative(t, _shifted, _plus);
            _shifted[k] = y[k] - h;
            Derivative(t, _shifted, _minus);
            _shifted[k] = y[k];
            for (var row = _s; row < Dimension; row++) jacobian[row, k] = (_plus[row] - _minus[row]) / (2 * h);
        }
        // Re-evaluate at y itself: J, the Hessians and J_a below must belong to y, not to a shifted state.
        Derivative(t, y, _plus);

        for (var i = 0; i < _s; i++)
            for (var k = 0; k < _s; k++) jacobian[i, k] = _jacobian[i, k];

        // d(dC_ij)/dc_kl for the linear map C ↦ J·C + C·Jᵀ, with c_kl standing for both C_kl and C_lk; the same map in every block.
        foreach (var block in CovarianceBlocks)
        {
            var shift = block - _s;
            for (var i = 0; i < _s; i++)
                for (var j = i; j < _s; j++)
                {
                    var row = Packed(i, j) + shift;
                    for (var k = 0; k < _s; k++)
                        for (var l = k; l < _s; l++)
                        {
                            var value = Delta(j, l) * _jacobian[i, k] + Delta(i, k) * _jacobian[j, l];
                            if (k != l) value += Delta(j, k) * _jacobian[i, l] + Delta(i, l) * _jacobian[j, k];
                            jacobian[row, Packed(k, l) + shift] += value;
                        }
                }
        }

        if (!WithMeanCorrection) return;
        var offset = CorrectionOffset;
        for (var i = 0; i < _s; i++)
            for (var k = 0; k < _s; k++) jacobian[offset + i, offset + k] = _meanJacobian[i, k];
        // d(dδ)/dc_kl = Σ_r N_·r·∂w_r/∂c_kl, w_r = ½·Σ H_r,ab·C_ab: each ordered pair (a, b) adds ½·H_r,ab.
        for (var r = 0; r < _rates.Length; r++)
        {
            var support = _expansion!.Support(r);
            var hessian = _expansion.Hessian(r);
            var species = _n.ChangedSpecies(r);
            var change = _n.Changes(r);
            for (var a = 0; a < support.Length; a++)
                for (var b = 0; b < support.Length; b++)
                {
                    var column = Packed(support[a], support[b]);
                    for (var e = 0; e < species.Length; e++)
                        jacobian[offset + species[e], column] += change[e] * 0.5 * hessian[a, b];
                }
        }
    }

    private static double Delta(int a, int b) => a == b ? 1.0 : 0.0;

    /// <inheritdoc/>
    public string ComponentName(int index)
    {
        var species = _network.Species;
        if (index < _s) return $"species {species[index]}";
        if (index < CorrectionOffset || (SplitsSources && index >= ReactionsOffset))
        {
            var part = !SplitsSources || index < ReactionsOffset ? "" : index < PartitioningOffset ? " fed by the reactions" : " fed by partitioning";
            var p = index - (index < CorrectionOffset ? _s : index < PartitioningOffset ? ReactionsOffset : PartitioningOffset);
            for (var i = 0; i < _s; i++)
            {
                var rowLength = _s - i;
                if (p < rowLength) return $"covariance of {species[i]} and {species[i + p]}{part}";
                p -= rowLength;
            }
        }
        return $"mean correction of {species[index - CorrectionOffset]}";
    }
}
