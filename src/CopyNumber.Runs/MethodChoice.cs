using CopyNumber.Deterministic;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Runs;

/// <summary>The names a run's method may be asked for by, what each stands for, and why a method was chosen.</summary>
public static class MethodChoice
{
    /// <summary>The method names a user may ask for; "auto" lets the rule of <see cref="MethodChooser"/> choose.</summary>
    public static readonly IReadOnlyList<string> Names = ["auto", "direct", "next-reaction", "tau-leap", "composition-rejection"];

    /// <summary>
    /// The method <paramref name="name"/> stands for on this network and why; "auto" decides from the
    /// rate-equation solution already computed for the run (null when it could not be).
    /// </summary>
    public static (SimulationMethod Method, string Reason) Resolve(string name, ReactionNetwork network, DeterministicSolution? rateEquations) => name switch
    {
        "auto" => MethodChooser.Choose(network, rateEquations),
        "next-reaction" => (SimulationMethod.NextReaction, $"{name} was requested"),
        "tau-leap" => (SimulationMethod.TauLeap, $"{name} was requested; {MethodChooser.LeapFormulas}"),
        "composition-rejection" => (SimulationMethod.CompositionRejection, $"{name} was requested"),
        "direct" => (SimulationMethod.Direct, $"{name} was requested"),
        _ => throw new ArgumentOutOfRangeException(nameof(name), name, "not a method name"),
    };

    /// <summary>The user-facing name of a method.</summary>
    public static string NameOf(SimulationMethod method) => method switch
    {
        SimulationMethod.NextReaction => "next-reaction",
        SimulationMethod.TauLeap => "tau-leap",
        SimulationMethod.CompositionRejection => "composition-rejection",
        _ => "direct",
    };

    /// <summary>The method a manifest names (the enumeration's name, as <c>manifest.json</c> records it), or null.</summary>
    public static SimulationMethod? FromManifest(string text) =>
        Enum.TryParse<SimulationMethod>(text, ignoreCase: false, out var method) && Enum.IsDefined(method) ? method : null;
}
