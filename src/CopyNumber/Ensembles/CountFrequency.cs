namespace CopyNumber.Ensembles;

/// <summary>One bar of a <see cref="CountHistogram"/>: how many observations had exactly this value.</summary>
/// <param name="Value">The observed count (any 64-bit integer; negative for differences such as A − B).</param>
/// <param name="Frequency">How many times it was observed, ≥ 1.</param>
public readonly record struct CountFrequency(long Value, long Frequency);
