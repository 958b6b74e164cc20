using System.Linq.Expressions;
using System.Runtime.CompilerServices;
using CopyNumber.Kinetics;
using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic.Compiled;

/// <summary>
/// The direct method's event loop for one segment, generated for one network: same arguments and effect as
/// <see cref="DirectMethod{TSelection}.Advance(ref Xoshiro256StarStar, ref double, double, long, GridRecorder, ref long, long)"/>
/// with <see cref="LinearSelection"/>, except that it leaves the end of the segment (<see cref="ExactSimulation"/>'s
/// Finish) to the caller.
/// </summary>
internal delegate SegmentEnd CompiledAdvance(
    SimulatorState state, ref RunawayGuard guard, ref Xoshiro256StarStar rng, ref double time, double horizon, long budget,
    GridRecorder recorder, ref long events, long maxEvents, ref LinearSelection selection);

/// <summary>
/// A direct-method event loop generated for one network (compiled expression trees,
/// <see cref="System.Linq.Expressions"/>), or why a network gets none. Shared by all threads: it holds no
/// per-replicate state. See docs/methods.md, "The direct method's compiled loop".
/// </summary>
/// <remarks>
/// <para>Which networks: at most <see cref="ReactionLimit"/> reactions and <see cref="SpeciesLimit"/> species,
/// every propensity of mass action (constant, c·x, c·x·y, c·x·(x−1)), and nothing that changes a constant or
/// interrupts the loop from inside: no state-triggered changes, no laws that read time, no bursts, no
/// parameters drawn per cell, no scheduled change of a parameter (a scheduled change of a count is fine: the
/// loop ends at the schedule time anyway). Everything else, and any network whose constants at run time
/// are not the folded ones (<see cref="Matches"/>), runs the general loop, which stays the reference.</para>
/// <para>Same bits: every operation of the general loop is generated in the same order with the same
/// operands — the firing program's update order (<see cref="FiringProgram.RefreshConstants"/>), the sum of
/// a0's changes, the linear selection's subtractions and its re-sum rule — so the two loops give identical
/// trajectories for one stream (tested). The constants c_j are folded into the code as literals; counts and
/// propensities live in locals for the whole segment and go back to their arrays at its end and before
/// anything out of line reads them (grid recording, the runaway check, error messages).</para>
/// </remarks>
internal sealed class CompiledDirectLoop
{
    /// <summary>Most reactions a generated loop handles: the linear selection's own limit.</summary>
    public const int ReactionLimit = SimulatorFactory.LinearSelectionLimit;

    /// <summary>Most species a generated loop keeps in locals.</summary>
    public const int SpeciesLimit = 64;

    // Per network, one loop per list of watched species (their order is the slot order the code calls with);
    // the cores' bounds are read from the state at run time, so they need no loop of their own.
    private static readonly ConditionalWeakTable<ReactionNetwork, System.Collections.Concurrent.ConcurrentDictionary<string, CompiledDirectLoop>> Cache = new();

    private readonly double[] _constants;

    private CompiledDirectLoop(string? refusal, CompiledAdvance? advance, double[] constants)
    {
        Refusal = refusal;
        Advance = advance;
        _constants = constants;
    }

    /// <summary>Why the network gets no generated loop; null when it gets one.</summary>
    public string? Refusal { get; }

    /// <summary>The generated loop; null when <see cref="Refusal"/> says why not.</summary>
    public CompiledAdvance? Advance { get; }

    /// <summary>
    /// The loop for <paramref name="network"/> following the modes of the species given <paramref name="cores"/>
    /// (none when null or empty), generated on first use and shared afterwards.
    /// </summary>
    public static CompiledDirectLoop For(ReactionNetwork network, IReadOnlyList<ModeCore>? cores = null)
    {
        cores ??= [];
        var loops = Cache.GetValue(network, _ => new());
        return loops.GetOrAdd(string.Join(",", cores.Select(c => c.Species)), _ => Generate(network, cores));
    }

    /// <summary>True when the state's constants are the ones folded into the code (always, unless parameters were replaced).</summary>
    public bool Matches(SimulatorState state)
    {
        if (Advance is null || state.StartParameters is not null) return false;
        var terms = state.Terms;
        for (var j = 0; j < terms.Length; j++)
            if (BitConverter.DoubleToInt64Bits(terms[j].Constant) != BitConverter.DoubleToInt64Bits(_constants[j])) return false;
        return true;
    }

    /// <summary>Why the generated loop does not apply to <paramref name="network"/>, or null.</summary>
    public static string? RefusalFor(ReactionNetwork network)
    {
        var reactions = network.Stoichiometry.ReactionCount;
        if (reactions == 0) return "no reactions";
        if (reactions > ReactionLimit) return $"more than {ReactionLimit} reactions";
        if (network.Stoichiometry.SpeciesCount > SpeciesLimit) return $"more than {SpeciesLimit} species";
        if (network.Triggers.Count > 0) return "state-triggered changes";
        if (network.TimeDependence.Any) return "laws that read time";
        if (network.Bursts.Any) return "bursts";
        if (network.Variability.Any) return "parameters drawn per cell";
        if (network.Schedule.Any(change => change.Target == ScheduleTarget.Parameter)) return "scheduled parameter changes";
        for (var j = 0; j < reactions; j++)
            if (network.Propensities.Form(j) is not (PropensityForm.Constant or PropensityForm.Unimolecular or PropensityForm.Bimolecular or PropensityForm.Homodimer))
                return "a propensity that is not of mass action with at most two reactant molecules";
        return null;
    }

    private static CompiledDirectLoop Generate(ReactionNetwork network, IReadOnlyList<ModeCore> cores)
    {
        var refusal = RefusalFor(network);
        if (refusal is not null) return new CompiledDirectLoop(refusal, null, []);
        // The general loop's program, built as the simulator builds it: its update order is the order to copy.
        var state = new SimulatorState(network, cores);
        state.Reset();
        state.RefreshConstants();
        var effects = new ReactionEffects(network, includeFired: false);
        var program = new FiringProgram(effects, state);
        program.RefreshConstants(state);
        if (effects.IsBroad.Contains(true) || effects.MayMakeNegative.Contains(true))
            return new CompiledDirectLoop("a reaction with out-of-line firing", null, []);
        var constants = state.Terms.Select(term => term.Constant).ToArray();
        var advance = new DirectLoopCompiler(state, program).Compile();
        return new CompiledDirectLoop(null, advance, constants);
    }
}
