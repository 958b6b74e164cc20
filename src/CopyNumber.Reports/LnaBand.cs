namespace CopyNumber.Reports;

/// <summary>
/// The linear noise approximation's ±2σ band around the rate equation, as drawn beside the ensemble. For a species
/// the lower edge is clipped at 0 copies: counts cannot be negative, and where rate equation − 2σ falls below zero
/// the LNA's normal law (van Kampen 1992, Stochastic Processes in Physics and Chemistry; quoted from memory)
/// is a poor description of the distribution anyway, which the figure's caption then says.
/// </summary>
internal static class LnaBand
{
    /// <summary>The caption's note when some lower edge was clipped.</summary>
    public const string ClippedNote = " The LNA band is clipped at 0 copies where the rate equation − 2σ falls below it: counts cannot be negative, and there the LNA's normal law does not describe the distribution.";

    /// <param name="centre">The rate equation at each time.</param>
    /// <param name="variance">The LNA variance at each time (negative round-off counts as 0).</param>
    /// <param name="isSpecies">True for a species (a count that is never negative); readouts may be negative and are not clipped.</param>
    public static (double[] Lower, double[] Upper, bool Clipped) Of(IReadOnlyList<double> centre, IReadOnlyList<double> variance, bool isSpecies)
    {
        var lower = new double[centre.Count];
        var upper = new double[centre.Count];
        var clipped = false;
        for (var k = 0; k < centre.Count; k++)
        {
            var halfWidth = 2 * Math.Sqrt(Math.Max(variance[k], 0));
            lower[k] = centre[k] - halfWidth;
            upper[k] = centre[k] + halfWidth;
            if (isSpecies && lower[k] < 0)
            {
                lower[k] = 0;
                clipped = true;
            }
        }
        return (lower, upper, clipped);
    }
}
