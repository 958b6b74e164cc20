namespace CopyNumber.Kinetics;

/// <summary>
/// A compiled expression evaluated on integer copy numbers, as the stochastic simulators see the state.
/// </summary>
/// <param name="counts">Copy numbers, indexed like <see cref="Network.ReactionNetwork.Species"/>.</param>
/// <param name="parameters">Current parameter values, indexed like <see cref="Network.ReactionNetwork.Parameters"/>.</param>
public delegate double CountLaw(long[] counts, double[] parameters);

/// <summary>
/// A compiled expression evaluated on a real-valued state in copy-number units (counts, not
/// concentrations), as the rate equations see it.
/// </summary>
public delegate double StateLaw(double[] state, double[] parameters);
