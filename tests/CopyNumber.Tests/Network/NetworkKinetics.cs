using CopyNumber.Network;

namespace CopyNumber.Tests.Network;

/// <summary>Shorthands for the per-simulator state a test needs to evaluate a compiled network.</summary>
internal static class NetworkKinetics
{
    /// <summary>The stochastic constants c_j for the given parameter values.</summary>
    public static double[] ConstantsFor(this ReactionNetwork network, double[] parameters)
    {
        var constants = new double[network.Reactions.Count];
        network.Propensities.ComputeConstants(parameters, constants);
        return constants;
    }

    /// <summary>A copy of the initial parameter values and the constants computed from them.</summary>
    public static (double[] Parameters, double[] Constants) InitialKinetics(this ReactionNetwork network)
    {
        var parameters = network.InitialParameterValues.ToArray();
        return (parameters, network.ConstantsFor(parameters));
    }
}
