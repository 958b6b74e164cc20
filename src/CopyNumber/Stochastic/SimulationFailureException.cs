using System.Globalization;
using System.Text;
using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// A replicate could not go on: its message is written for the model's author and names the reaction or
/// species, the model time and the state.
/// </summary>
public sealed class SimulationFailureException : CopyNumberException
{
    /// <summary>Creates the exception with a user-facing message.</summary>
    /// <param name="message">One sentence saying what went wrong, without a trailing full stop.</param>
    /// <param name="time">Model time at which the run stopped.</param>
    public SimulationFailureException(string message, double time) : base(message, ErrorKind.RunFailed)
    {
        Time = time;
    }

    /// <summary>Model time at which the run stopped.</summary>
    public double Time { get; }

    internal static SimulationFailureException BadPropensity(ReactionNetwork network, int reaction, double value, double time, long[] counts) =>
        new(Kinetics.UnusableRate.Describe(network.Reactions[reaction].Name, "propensity", value, time, State(network, counts)), time);

    internal static SimulationFailureException FiringMadeNegative(ReactionNetwork network, int reaction, int species, double time, long[] counts) =>
        new($"reaction '{network.Reactions[reaction].Name}' fired at time {Number(time)} and made species '{network.Species[species]}' negative; " +
            $"its rate law must be 0 whenever there are too few '{network.Species[species]}' to consume (state after firing: {State(network, counts)})", time);

    internal static SimulationFailureException ScheduleNotFinite(ScheduledChange change, double value, double time) =>
        new($"at time {Number(time)} {Origin(change)} computes {Number(value)} for '{change.TargetName}', which is not a usable finite number", time);

    internal static SimulationFailureException ScheduleMadeNegative(ScheduledChange change, long result, double time) =>
        new($"at time {Number(time)} {Origin(change)} makes species '{change.TargetName}' {result}; copy numbers cannot be negative", time);

    /// <summary>A timed change is the schedule's; a triggered one (no time of its own) is a state-triggered change.</summary>
    private static string Origin(ScheduledChange change) => double.IsNaN(change.Time) ? "a state-triggered change" : "the schedule";

    internal static SimulationFailureException TriggersCascade(StateTrigger trigger, double time, int rounds) =>
        new($"at time {Number(time)} state-triggered changes kept setting each other off for {rounds} rounds (last: '{trigger.Text}' on line {trigger.Position.Line}); " +
            "a change whose assignments make another condition turn true, and so on without end, has no defined result", time);

    /// <summary>2^53: the largest magnitude up to which a double holds every integer, so a count readout is exact.</summary>
    internal const double LargestExactReadout = 9007199254740992;

    internal static SimulationFailureException ReadoutOutOfRange(ReactionNetwork network, Readout readout, double value, double time, long[] counts) =>
        new($"readout '{readout.Name}' = {readout.Text} is {Number(value)} at time {Number(time)}; an integer readout is stored as an exact count " +
            $"and must stay within ±2^53 = ±9007199254740992 (state: {State(network, counts)})", time);

    internal static SimulationFailureException CountOverflow(ReactionNetwork network, int reaction, int species, long amount, double time, long[] counts) =>
        new($"reaction '{network.Reactions[reaction].Name}' fired at time {Number(time)} would take species '{network.Species[species]}' from " +
            $"{counts[species].ToString(CultureInfo.InvariantCulture)} by {amount.ToString(CultureInfo.InvariantCulture)} past 2^62 = {FiringProgram.CountLimit.ToString(CultureInfo.InvariantCulture)} copies, " +
            $"beyond what a 64-bit count holds safely; {Explosive(network, species)} (state: {State(network, counts)})", time);

    private static string Explosive(ReactionNetwork network, int species) =>
        $"the network is probably explosive: give '{network.Species[species]}' a decay or bound its production, or stop replicates earlier with --max-events";

    internal static SimulationFailureException LeapOverflow(ReactionNetwork network, int reaction, int species, double change, long before, double time, long[] counts) =>
        new($"a tau-leap at time {Number(time)} would change species '{network.Species[species]}' from {before.ToString(CultureInfo.InvariantCulture)} " +
            $"by {Number(change)} through reaction '{network.Reactions[reaction].Name}', past 2^62 = {FiringProgram.CountLimit.ToString(CultureInfo.InvariantCulture)} copies, " +
            $"beyond what a 64-bit count holds safely; {Explosive(network, species)} (state: {State(network, counts)})", time);

    internal static SimulationFailureException LeapTooLarge(ReactionNetwork network, int reaction, double mean, double time, long[] counts) =>
        new($"a tau-leap at time {Number(time)} would fire reaction '{network.Reactions[reaction].Name}' about {Number(mean)} times, " +
            $"more than the Poisson sampler supports (2^52); the network is probably explosive: add a decay or bound the growth, " +
            $"or stop replicates earlier with --max-events (state: {State(network, counts)})", time);

    internal static SimulationFailureException TotalPropensityOverflow(ReactionNetwork network, int largest, double time, long[] counts) =>
        new($"at time {Number(time)} the propensities add up to more than the largest double (the biggest is reaction " +
            $"'{ReactionName(network, largest)}'), so the next event time cannot be computed; the network is probably explosive: " +
            $"add a decay or check the rate constants, or stop replicates earlier with --max-events (state: {State(network, counts)})", time);

    internal static SimulationFailureException Runaway(ReactionNetwork network, int largest, double total, double time, double horizon,
        double projected, double bound, double growth, long[] counts) =>
        new($"the run looks explosive: at time {Number(time)} the propensities add up to {Number(total)} events per unit time " +
            $"(the biggest is reaction '{ReactionName(network, largest)}')" +
            (growth > 0 ? $" and their total grows by a factor e every {Number(Math.Round(1 / growth, 3))} time units" : "") +
            $", so reaching time {Number(horizon)} would take about {Number(Math.Round(projected, 0))} more events in this replicate, " +
            $"more than the {Number(bound)} a replicate of this run may take; " +
            $"add a decay or bound the growth, shorten the run, use tau-leaping, or set --max-events to run it anyway with each replicate " +
            $"stopped after that many events (state: {State(network, counts)})", time);

    private static string ReactionName(ReactionNetwork network, int reaction) =>
        reaction >= 0 && reaction < network.Reactions.Count ? network.Reactions[reaction].Name : "?";

    private static string Number(double value) => value.ToString("G", CultureInfo.InvariantCulture);

    /// <summary>The first species as name=count; enough to locate the problem without flooding the terminal.</summary>
    private static string State(ReactionNetwork network, long[] counts)
    {
        const int shown = 12;
        var text = new StringBuilder();
        for (var i = 0; i < counts.Length && i < shown; i++)
        {
            if (i > 0) text.Append(", ");
            text.Append(network.Species[i]).Append('=').Append(counts[i].ToString(CultureInfo.InvariantCulture));
        }
        if (counts.Length > shown) text.Append(", … (").Append(counts.Length - shown).Append(" more)");
        return text.ToString();
    }
}
