namespace CopyNumber.Network;

/// <summary>
/// The units a model declares (<c>time unit minute</c>, <c>size unit litre</c>). They are labels: the
/// engine computes in whatever unit the numbers are written in, and prints the declared names beside
/// times and sizes so a reader knows what they are.
/// </summary>
/// <param name="Time">The time unit's name, or null when the model declares none.</param>
/// <param name="Size">The unit of <c>size</c>, or null.</param>
public sealed record ModelUnits(string? Time, string? Size)
{
    /// <summary>No declared unit.</summary>
    public static ModelUnits None { get; } = new(null, null);

    /// <summary>The heading of a time column or axis: <c>time (minute)</c>, or <c>time</c> without a declared unit.</summary>
    public string TimeHeading => Time is null ? "time" : $"time ({Time})";
}
