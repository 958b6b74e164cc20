namespace CopyNumber.Cli.Commands;

/// <summary>
/// The rule for a command's <c>--out FILE</c> (export, solve): a directory is refused, and an existing file is
/// replaced only with <c>--force</c>, so a second command never silently overwrites the first one's result.
/// Checked before any work, so a refusal costs nothing.
/// </summary>
internal static class OutputFile
{
    /// <param name="destination">The --out value, or null when the command prints instead.</param>
    /// <param name="force">Whether --force was given.</param>
    /// <param name="example">A file name to suggest when a directory was given, e.g. <c>model.xml</c>.</param>
    /// <exception cref="UserInputException">The destination is a directory, or exists without --force (exit 2).</exception>
    public static void Check(string? destination, bool force, string example)
    {
        if (destination is null) return;
        if (Directory.Exists(destination))
            throw new UserInputException($"--out '{destination}' is a directory; give a file name such as {example}");
        if (File.Exists(destination) && !force)
            throw new UserInputException($"--out '{destination}' exists; give --force to replace it");
    }
}
