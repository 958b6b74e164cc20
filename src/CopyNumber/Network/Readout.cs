using CopyNumber.Kinetics;

namespace CopyNumber.Network;

/// <summary>
/// A derived quantity reported beside the species. When the expression is an integer combination of
/// species counts (e.g. <c>protein + 2*dimer</c>) it is itself a count and gets an exact histogram;
/// otherwise it gets moments only.
/// </summary>
/// <param name="Name">Readout name.</param>
/// <param name="Text">The expression as written.</param>
/// <param name="IsCount">True when the value is an integer for every integer state.</param>
/// <param name="OnCounts">The expression on a stochastic state.</param>
/// <param name="OnState">The expression on a real-valued rate-equation state.</param>
public sealed record Readout(string Name, string Text, bool IsCount, CountLaw OnCounts, StateLaw OnState);
