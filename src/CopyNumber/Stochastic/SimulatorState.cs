using System.Diagnostics.CodeAnalysis;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using CopyNumber.Kinetics;
using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>
/// One simulator's mutable state: copy numbers, parameter values, stochastic constants c_j and the
/// propensity terms built from them. Owned by one thread; the network it reads is shared and immutable.
/// </summary>
internal sealed class SimulatorState
{
    private readonly ReactionNetwork _network;
    private readonly Propensities _propensities;

    /// <param name="network">The network simulated.</param>
    /// <param name="cores">The species whose modes are watched at the events (<see cref="ModeWatch"/>); null or empty for none.</param>
    public SimulatorState(ReactionNetwork network, IReadOnlyList<ModeCore>? cores = null)
    {
        _network = network;
        _propensities = network.Propensities;
        var species = network.Stoichiometry.SpeciesCount;
        var reactions = network.Stoichiometry.ReactionCount;
        if (network.Species.Count != species || network.InitialCounts.Count != species)
            throw new ArgumentException("the network's species list, initial counts and N disagree on the number of species", nameof(network));
        if (_propensities.Count != reactions || network.Reactions.Count != reactions)
            throw new ArgumentException("the network's reactions, propensities and N disagree on the number of reactions", nameof(network));
        if (network.Parameters.Count != network.InitialParameterValues.Count)
            throw new ArgumentException("the network's parameter names and values disagree in number", nameof(network));
        ModelSupport.RequireSimulation(network);
        Counts = new long[species];
        Parameters = network.ParameterValuesWithTime();
        Constants = new double[reactions];
        Terms = new PropensityTerm[reactions];
        Switches = new TransitionCounter(network);
        Modes = new ModeWatch(network, cores ?? []);
        _burstMeans = new double[network.Bursts.All.Count];
        _burstLogRatio = new double[_burstMeans.Length];
        Triggers = new TriggerWatch(network);
        for (var j = 0; j < reactions; j++)
        {
            var form = _propensities.Form(j);
            var reactants = _propensities.Reactants(j);
            Terms[j].Form = form;
            if (form is PropensityForm.Unimolecular or PropensityForm.Bimolecular or PropensityForm.Homodimer)
                Terms[j].SpeciesA = CheckedSpecies(reactants[0].Species, species);
            if (form is PropensityForm.Bimolecular)
                Terms[j].SpeciesB = CheckedSpecies(reactants[1].Species, species);
        }
    }

    public ReactionNetwork Network => _network;

    /// <summary>Sets the time that laws reading <c>time</c> see (the parameter array's time slot).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void SetTime(double time) => Parameters[_network.TimeSlot] = time;
    public long[] Counts { get; }
    public double[] Parameters { get; }
    public double[] Constants { get; }
    public PropensityTerm[] Terms { get; }

    /// <summary>This replicate's switches of the two-state species, counted at the events.</summary>
    public TransitionCounter Switches { get; }

    /// <summary>This replicate's visits to the modes of the species given cores, followed at the events.</summary>
    public ModeWatch Modes { get; }

    /// <summary>This replicate's state-triggered changes: which conditions hold, which wait to apply.</summary>
    public TriggerWatch Triggers { get; }
    public int SpeciesCount => Counts.Length;
    public int ReactionCount => Terms.Length;

    /// <summary>Changes whenever recomputing <see cref="Constants"/> changed one (and at the first computation), so copies know when to follow.</summary>
    public int ConstantsVersion { get; private set; }

    /// <summary>The parameter values a replicate starts from instead of the network's (a draw of extrinsic variability); null for the network's.</summary>
    public double[]? StartParameters { get; set; }

    /// <summary>Back to the network's initial counts and parameter values, constants recomputed.</summary>
    public void Reset()
    {
        for (var i = 0; i < Counts.Length; i++) Counts[i] = _network.InitialCounts[i];
        if (StartParameters is { } start) Array.Copy(start, Parameters, _network.TimeSlot);
        else for (var p = 0; p < _network.TimeSlot; p++) Parameters[p] = _network.InitialParameterValues[p];
        RefreshConstants();
    }

    /// <summary>
    /// Starts a replicate at t = 0: initial state, the schedule's changes due at t ≤ 0 applied, the
    /// triggers' conditions evaluated on the result (their starting values), nothing recorded yet.
    /// </summary>
    public void StartReplicate(ScheduleCursor schedule, GridRecorder recorder, TimeGrid grid, ITrajectoryObserver observer)
    {
        Reset();
        Switches.Start();
        schedule.Start(grid);
        schedule.ApplyDue(0.0, this);
        Triggers.Start(this);
        if (Modes.Watching) Modes.Start(Counts);
        recorder.Start(grid, observer, Parameters);
    }

    /// <summary>
    /// The stream the geometric burst sizes are drawn from, seeded from the replicate's own stream at its
    /// start (<see cref="SeedBursts"/>), so the simulators' event loops keep their generator in registers.
    /// </summary>
    private Xoshiro256StarStar _burstStream;
    private readonly double[] _burstMeans;
    private readonly double[] _burstLogRatio;

    /// <summary>Seeds the burst stream from one draw of the replicate's stream; does nothing (draws nothing) without bursts.</summary>
    public void SeedBursts(ref Xoshiro256StarStar rng)
    {
        if (_burstMeans.Length > 0) _burstStream = new Xoshiro256StarStar(rng.NextUInt64());
    }

    /// <summary>
    /// Adds the rest of reaction <paramref name="reaction"/>'s bursts to the counts after its firing, whose
    /// N column already added 1 copy per burst: B − 1 more, B geometric (<see cref="BurstProducts"/>).
    /// </summary>
    public void FireBursts(int reaction, double time) => AddBursts(reaction, 1, Counts, time);

    /// <summary>Adds the rest of <paramref name="firings"/> firings' bursts to <paramref name="counts"/> (tau-leaping's trial counts).</summary>
    public void AddBursts(int reaction, long firings, long[] counts, double time)
    {
        var (start, end) = _network.Bursts.Of(reaction);
        for (var k = start; k < end; k++)
        {
            var species = _network.Bursts.All[k].Species;
            for (var f = 0L; f < firings; f++)
            {
                var extra = GeometricSampler.Sample(ref _burstStream, _burstLogRatio[k]) - 1;
                if (extra > FiringProgram.CountLimit - counts[species]) ThrowCountOverflow(reaction, species, extra + 1, time);
                counts[species] += extra;
            }
        }
    }

    /// <summary>Recomputes c_j from the current parameters; call after a parameter changes.</summary>
    public void RefreshConstants()
    {
        _propensities.ComputeConstants(Parameters, Constants);
        if (_burstMeans.Length > 0) RefreshBursts();
        // The version moves only when a constant really changed, so the reset at every replicate's start
        // does not make the simulators recopy the constants of a large network each time.
        var changed = false;
        for (var j = 0; j < Terms.Length; j++)
        {
            if (Terms[j].Constant.Equals(Constants[j]) && ConstantsVersion > 0) continue;
            Terms[j].Constant = Constants[j];
            changed = true;
        }
        if (changed) ConstantsVersion++;
    }

    private void RefreshBursts()
    {
        _network.Bursts.Means(Parameters, _burstMeans);
        for (var k = 0; k < _burstMeans.Length; k++)
        {
            if (!(_burstMeans[k] >= 0) || !double.IsFinite(_burstMeans[k]))
                throw new SimulationFailureException(
                    $"the mean burst size of '{_network.Species[_network.Bursts.All[k].Species]}' in reaction '{_network.Reactions[_network.Bursts.All[k].Reaction].Name}' " +
                    $"is {_burstMeans[k].ToString("G6", System.Globalization.CultureInfo.InvariantCulture)} with the parameters in force; it must be a finite number, zero or more", 0);
            _burstLogRatio[k] = GeometricSampler.LogRatio(_burstMeans[k]);
        }
    }

    /// <summary>The general mass-action product or a rate law, kept out of line so the common forms stay small.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    public double EvaluateGeneral(int reaction) => _propensities.Evaluate(reaction, Counts, Constants, Parameters);

    /// <summary>a_j at the current state, stopping the run when the value is unusable.</summary>
    public double Evaluate(int reaction, double time)
    {
        var a = PropensityTerm.Evaluate(ref Terms[reaction], ref MemoryMarshal.GetArrayDataReference(Counts), reaction, this);
        if (!PropensityTerm.IsUsable(a)) ThrowBadPropensity(reaction, a, time);
        return a;
    }

    [DoesNotReturn, MethodImpl(MethodImplOptions.NoInlining)]
    public void ThrowBadPropensity(int reaction, double value, double time) =>
        throw SimulationFailureException.BadPropensity(_network, reaction, value, time, Counts);

    [DoesNotReturn, MethodImpl(MethodImplOptions.NoInlining)]
    public void ThrowFiringMadeNegative(int reaction, int species, double time) =>
        throw SimulationFailureException.FiringMadeNegative(_network, reaction, species, time, Counts);

    [DoesNotReturn, MethodImpl(MethodImplOptions.NoInlining)]
    public void ThrowCountOverflow(int reaction, int species, long amount, double time) =>
        throw SimulationFailureException.CountOverflow(_network, reaction, species, amount, time, Counts);

    [DoesNotReturn, MethodImpl(MethodImplOptions.NoInlining)]
    public void ThrowLeapOverflow(int reaction, int species, double change, double time, long before) =>
        throw SimulationFailureException.LeapOverflow(_network, reaction, species, change, before, time, Counts);

    [DoesNotReturn, MethodImpl(MethodImplOptions.NoInlining)]
    public void ThrowLeapTooLarge(int reaction, double mean, double time) =>
        throw SimulationFailureException.LeapTooLarge(_network, reaction, mean, time, Counts);

    [DoesNotReturn, MethodImpl(MethodImplOptions.NoInlining)]
    public void ThrowTotalOverflow(double time, ReadOnlySpan<double> propensities) =>
        throw SimulationFailureException.TotalPropensityOverflow(_network, LargestOf(propensities), time, Counts);

    [DoesNotReturn, MethodImpl(MethodImplOptions.NoInlining)]
    public void ThrowRunaway(double time, double horizon, double total, double projected, double bound, double growth, ReadOnlySpan<double> propensities) =>
        throw SimulationFailureException.Runaway(_network, LargestOf(propensities), total, time, horizon, projected, bound, growth, Counts);

    /// <summary>The reaction with the largest propensity (ties: the first), or −1 for an empty span.</summary>
    private static int LargestOf(ReadOnlySpan<double> propensities)
    {
        var best = -1;
        for (var j = 0; j < propensities.Length; j++)
            if (best < 0 || propensities[j] > propensities[best] || double.IsNaN(propensities[j])) best = j;
        return best;
    }

    private static int CheckedSpecies(int index, int species) =>
        (uint)index < (uint)species ? index : throw new ArgumentException($"a propensity reads species index {index}, outside the network's {species} species");
}
