namespace CopyNumber.Cli.Rendering;

/// <summary>
/// How the console shows a file or folder: always as a full path. The output folder is resolved to a full
/// path before anything is written (OutputFolder), so every printed path follows that one rule rather than
/// mixing the user's relative spelling with absolute ones; a full path also stays valid when copied into a
/// job script that runs elsewhere.
/// </summary>
internal static class Paths
{
    public static string Shown(string path) => Path.GetFullPath(path);

    public static string Shown(IEnumerable<string> paths) => string.Join(", ", paths.Select(Shown));
}
