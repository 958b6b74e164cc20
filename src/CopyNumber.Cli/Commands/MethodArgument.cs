using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Cli.Commands;

/// <summary>The --method names and their meaning, shared by simulate and sweep.</summary>
internal static class MethodArgument
{
    public static readonly string[] Names = ["auto", "direct", "next-reaction", "tau-leap", "composition-rejection"];

    /// <summary>The method a name stands for on this network, and why it was chosen.</summary>
    public static (SimulationMethod Method, string Reason) Resolve(string name, ReactionNetwork network, TimeGrid grid) => name switch
    {
        "auto" => MethodChooser.Choose(network, grid),
        "next-reaction" => (SimulationMethod.NextReaction, $"{name} was requested"),
        "tau-leap" => (SimulationMethod.TauLeap, $"{name} was requested; {MethodChooser.LeapFormulas}"),
        "composition-rejection" => (SimulationMethod.CompositionRejection, $"{name} was requested"),
        _ => (SimulationMethod.Direct, $"{name} was requested"),
    };

    /// <summary>The command-line name of a method.</summary>
    public static string NameOf(SimulationMethod method) => method switch
    {
        SimulationMethod.NextReaction => "next-reaction",
        SimulationMethod.TauLeap => "tau-leap",
        SimulationMethod.CompositionRejection => "composition-rejection",
        _ => "direct",
    };
}
