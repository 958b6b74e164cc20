namespace CopyNumber.Ensembles;

/// <summary>
/// A running sum with Neumaier's compensation (Neumaier 1974, "Rundungsfehleranalyse einiger Verfahren
/// zur Summation endlicher Summen", ZAMM 54:39–51): the rounding error of every addition is carried in a
/// second term, so the result is as accurate as if summed in twice the precision, whatever the order of
/// magnitude of the terms.
/// </summary>
internal struct CompensatedSum
{
    private double _sum;
    private double _compensation;

    /// <summary>Adds <paramref name="term"/>.</summary>
    public void Add(double term)
    {
        var next = _sum + term;
        _compensation += Math.Abs(_sum) >= Math.Abs(term) ? _sum - next + term : term - next + _sum;
        _sum = next;
    }

    /// <summary>The compensated total.</summary>
    public readonly double Value => _sum + _compensation;
}
