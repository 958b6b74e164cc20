namespace CopyNumber.Reports;

/// <summary>Shape checks on figure inputs, each failing with a message that names the data at fault.</summary>
internal static class InputChecks
{
    public static void NotNull(object? value, string what)
    {
        if (value is null) throw new ReportException($"{what} is missing.");
    }

    public static void Aligned(string owner, string name, Array? values, int expected, string alignedWith = "Time")
    {
        if (values is null) throw new ReportException($"{owner}: {name} is missing.");
        if (values.Length != expected)
            throw new ReportException(
                $"{owner}: {name} has {values.Length} values but {alignedWith} has {expected}; they must be aligned.");
    }
}
