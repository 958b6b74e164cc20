using System.Text.Json.Nodes;
using CopyNumber.Network;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// Issue 10, fault 6: one flipped bit in a shard's distributions.parquet was merged silently (exit 0, a
/// mean of 2.78e10 instead of 4969). Every table's SHA-256 (FIPS 180-4) is now recorded in the manifest
/// and verified by contrast, resume and merge; SHA-256 changes with any single flipped bit (a property of
/// the hash, common practice for integrity checks), so every flip below must be refused with exit 2 and
/// a message naming the file. Flip positions come from a fixed seed.
/// </summary>
public class ChecksumTests
{
    private const string Damaged = "was changed or damaged after it was written";

    [Fact]
    public void A_bit_flipped_in_any_table_of_a_run_folder_is_refused_by_contrast_and_resume()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var folder = scratch.File("run");
        Assert.Equal(0, CliRun.Of([.. Simulate(model, 2000, 7, "--paths", "40", "--no-contrast", "--out", folder)]).ExitCode);
        var flips = new Random(6);
        var tables = RunFiles.Tables.Where(t => File.Exists(Path.Combine(folder, t))).ToArray();
        Assert.Equal(6, tables.Length); // all but validation.parquet, which only tau-leaping runs write (covariances.parquet included)
        foreach (var table in tables)
        {
            var copy = CopyOf(folder, scratch.File($"flipped-{table}"));
            var file = Path.Combine(copy, table);
            FlipOneBit(file, flips);
            foreach (var run in new[] { CliRun.Of(["contrast", copy]), CliRun.Of(["simulate", "--resume", copy]) })
            {
                Assert.True(run.ExitCode == 2, $"{table}: exit {run.ExitCode}\n{run.Error}{run.Output}");
                Assert.Contains($"'{file}' {Damaged}", run.Error);
                AssertNoStackTrace(run);
            }
        }
    }

    [Fact]
    public void A_bit_flipped_in_any_table_of_either_of_two_shards_is_refused_by_merge()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var shards = new[] { scratch.File("shard-1"), scratch.File("shard-2") };
        for (var i = 0; i < 2; i++)
            Assert.Equal(0, CliRun.Of([.. Simulate(model, 2000, 7, "--paths", "200", "--shard", $"{i + 1}/2", "--out", shards[i])]).ExitCode);
        var flips = new Random(7);
        var attempt = 0;
        for (var damaged = 0; damaged < 2; damaged++)
        {
            foreach (var table in RunFiles.Tables.Where(t => File.Exists(Path.Combine(shards[damaged], t))))
            {
                attempt++;
                var copies = shards.Select((s, i) => CopyOf(s, scratch.File($"copy-{attempt}-{i}"))).ToArray();
                var file = Path.Combine(copies[damaged], table);
                FlipOneBit(file, flips);
                var merge = CliRun.Of(["merge", copies[0], copies[1], "--out", scratch.File($"merged-{attempt}"), "--no-contrast"]);
                Assert.True(merge.ExitCode == 2, $"{file}: exit {merge.ExitCode}\n{merge.Error}{merge.Output}");
                Assert.Contains($"'{file}' {Damaged}", merge.Error);
                AssertNoStackTrace(merge);
            }
        }
        Assert.Equal(12, attempt); // six tables in each shard, covariances.parquet among them
    }

    /// <summary>
    /// Folders written before checksums existed carry no "files" in their manifest. They are read as
    /// before (their tables are checked for agreement with the manifest as they always were), with a
    /// warning that damage to them cannot be detected: refusing them would throw away finished runs.
    /// </summary>
    [Fact]
    public void A_folder_written_without_checksums_is_read_by_contrast_merge_and_resume_with_a_warning()
    {
        using var scratch = new ScratchFolder();
        var modelPath = WriteModel(scratch);
        var model = ModelLoader.Load(modelPath).Model!;
        var whole = scratch.File("whole");
        Directory.CreateDirectory(whole);
        ResumeTests.Run(model, whole, 1, resume: false, CancellationToken.None);
        var old = scratch.File("old");
        Directory.CreateDirectory(old);
        using (var cancel = new CancellationTokenSource())
            ResumeTests.Run(model, old, 1, resume: false, cancel.Token, block => { if (block == 2) cancel.Cancel(); });
        WithoutChecksums(old);

        var resumed = CliRun.Of(["simulate", "--resume", old, "--no-contrast"]);
        Assert.Equal(0, resumed.ExitCode);
        Assert.Contains("without checksums", resumed.Error);
        foreach (var file in ResultFiles.Append(RunFiles.Paths)) AssertSameCells(whole, old, file);

        WithoutChecksums(old);
        var contrast = CliRun.Of(["contrast", old]);
        Assert.Equal(0, contrast.ExitCode);
        Assert.Contains("without checksums", contrast.Error);
        var merged = scratch.File("merged");
        var merge = CliRun.Of(["merge", old, "--out", merged, "--no-contrast"]);
        Assert.Equal(0, merge.ExitCode);
        Assert.Contains("without checksums", merge.Error);
        // What merge writes carries checksums again.
        Assert.DoesNotContain("without checksums", CliRun.Of(["contrast", merged]).Error);
    }

    /// <summary>Rewrites the manifest as a version before checksums wrote it: the same fields less "files".</summary>
    private static void WithoutChecksums(string folder)
    {
        var path = Path.Combine(folder, RunFiles.Manifest);
        var manifest = JsonNode.Parse(File.ReadAllText(path))!.AsObject();
        Assert.True(manifest.Remove(ManifestFields.Files));
        File.WriteAllText(path, manifest.ToJsonString());
    }

    private static void FlipOneBit(string path, Random random)
    {
        var bytes = File.ReadAllBytes(path);
        bytes[random.Next(bytes.Length)] ^= (byte)(1 << random.Next(8));
        File.WriteAllBytes(path, bytes);
    }

    private static string CopyOf(string folder, string copy)
    {
        Directory.CreateDirectory(copy);
        foreach (var file in Directory.GetFiles(folder)) File.Copy(file, Path.Combine(copy, Path.GetFileName(file)));
        return AtomicFile.FullPath(copy);
    }
}
