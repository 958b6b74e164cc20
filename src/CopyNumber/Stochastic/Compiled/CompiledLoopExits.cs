namespace CopyNumber.Stochastic.Compiled;

/// <summary>
/// The out-of-line exits of the generated loop, each handing over to the rule the general loop uses, with
/// the propensities as an array (expression trees cannot pass spans).
/// </summary>
internal static class CompiledLoopExits
{
    public static void TotalOverflow(SimulatorState state, double time, double[] propensities) =>
        state.ThrowTotalOverflow(time, propensities);

    public static void CheckRunaway(ref RunawayGuard guard, SimulatorState state, double total, double time, double horizon, double[] propensities) =>
        DirectMethod<LinearSelection>.CheckRunaway(ref guard, state, total, time, horizon, propensities);

    public static void CountOverflow(SimulatorState state, int reaction, int species, long amount, double time) =>
        state.ThrowCountOverflow(reaction, species, amount, time);

    public static void BadPropensity(SimulatorState state, int reaction, double value, double time) =>
        state.ThrowBadPropensity(reaction, value, time);

    public static void NothingToSelect() => throw new InvalidOperationException("selection with every propensity 0");
}
