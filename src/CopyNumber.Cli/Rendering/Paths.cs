namespace CopyNumber.Cli.Rendering;

/// <summary>
/// How the console shows a file or folder: relative to the folder the command was started in when it lies
/// beneath it (<c>runs/toggle_pair-20260302-143000</c>), so the printed path is short and can be typed back into
/// the next command from the same place; in full when it lies elsewhere, since a path climbing out with
/// <c>..</c> is neither short nor easy to check. Every printed path goes through this one rule.
/// </summary>
internal static class Paths
{
    public static string Shown(string path) => Relative(path, Directory.GetCurrentDirectory());

    public static string Shown(IEnumerable<string> paths) => string.Join(", ", paths.Select(Shown));

    /// <summary><paramref name="path"/> as shown to a user whose command started in <paramref name="startFolder"/>.</summary>
    internal static string Relative(string path, string startFolder)
    {
        var full = Path.GetFullPath(path, startFolder);
        var relative = Path.GetRelativePath(startFolder, full);
        var outside = relative == ".." || relative.StartsWith(".." + Path.DirectorySeparatorChar, StringComparison.Ordinal) || Path.IsPathRooted(relative);
        return outside ? full : relative;
    }
}
