using CourseSim.Experiments;
using CourseSim.Settings;
using CourseSim.Storage;

namespace CourseSim.Tests.Experiments;

/// <summary>The resume contract (docs/experiments.md, "Resume"): kept runs must be this experiment's and intact.</summary>
public class ResumeTests
{
    static (int Code, string Out, string Err) Cli(params string[] args)
    {
        var o = new StringWriter(); var e = new StringWriter();
        int code = CourseSim.Cli.Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    [Fact]
    public void ResumingWithAnotherSeedIsRefusedNamingTheSeed()
    {
        string exp = BatchTests.MakeExperiment(), dir = Directory.CreateTempSubdirectory("cs-rs-").FullName;
        var first = Cli("batch", exp, "--races", "2", "--threads", "2", "--out", dir);
        Assert.True(first.Code == 0, first.Err);
        var again = Cli("batch", exp, "--races", "2", "--out", dir, "--resume", "--set", "seed=78");
        Assert.Equal(2, again.Code);
        Assert.Contains("seed: the runs here have '9', this run asks for '78'", again.Err);
        Assert.DoesNotContain("bug", again.Err);
        // The summary still describes the races that are there: seed 9.
        Assert.Contains("\"seed\": 9", File.ReadAllText(Path.Combine(dir, "summary.json")));
        // A changed variant is refused too; the same set-up with more races is accepted.
        var spec = ExperimentFile.Load(exp, ["variants.other.set=course.beat_m=450"], 2);
        var e = Assert.Throws<SettingsException>(() => BatchRunner.Run(spec, dir, 1, true));
        Assert.Contains("variants:", e.Message);
        var more = Cli("batch", exp, "--races", "3", "--out", dir, "--resume");
        Assert.True(more.Code == 0, more.Err);
    }

    [Fact]
    public void RunsWithoutAManifestAreNotTakenOnTrust()
    {
        var spec = ExperimentFile.Load(Fresh.Value.Exp, null, 3);
        string dir = CopyOfFresh();
        File.Delete(BatchManifest.PathIn(dir));
        var e = Assert.Throws<SettingsException>(() => BatchRunner.Run(spec, dir, 1, true));
        Assert.Contains("no manifest", e.Message);
    }

    /// <summary>One uninterrupted batch of three races per variant, shared: each test works on its own copy.</summary>
    static readonly Lazy<(string Exp, string Dir, string Csv)> Fresh = new(() =>
    {
        string exp = BatchTests.MakeExperiment(), dir = Directory.CreateTempSubdirectory("cs-rfresh-").FullName;
        var csv = BatchRunner.ResultsCsv(BatchRunner.Run(ExperimentFile.Load(exp, null, 3), dir, 2, false));
        return (exp, dir, csv);
    });

    static string CopyOfFresh()
    {
        string to = Directory.CreateTempSubdirectory("cs-rcopy-").FullName;
        foreach (var f in Directory.GetFiles(Fresh.Value.Dir, "*", SearchOption.AllDirectories))
        {
            string target = Path.Combine(to, Path.GetRelativePath(Fresh.Value.Dir, f));
            Directory.CreateDirectory(Path.GetDirectoryName(target)!);
            File.Copy(f, target);
        }
        return to;
    }

    [Theory]
    [InlineData("empty")]
    [InlineData("damaged")]
    [InlineData("no checksum")]
    public void AnEmptyOrDamagedRunFileIsReportedAndRacedAgain(string harm)
    {
        var spec = ExperimentFile.Load(Fresh.Value.Exp, null, 3);
        string dir = CopyOfFresh(), expected = Fresh.Value.Csv;
        string victim = BatchRunner.RunFile(dir, "other", 1);
        string text = File.ReadAllText(victim);
        File.WriteAllText(victim, harm switch
        {
            "empty" => "",
            // One digit of the first elapsed time changed: the row still parses, only the checksum catches it.
            "damaged" => text.Replace(",true,", ",false,"),
            _ => text[..text.IndexOf("# sha256", StringComparison.Ordinal)],
        });
        Assert.NotEqual(text, File.ReadAllText(victim));
        var warnings = new List<string>();
        int resumed = -1;
        var rows = BatchRunner.Run(spec, dir, 1, true, p => { if (resumed < 0) resumed = p.Resumed; }, default, w => warnings.Add(w));
        Assert.Equal(5, resumed); // six races, one not trusted
        var w = Assert.Single(warnings);
        Assert.Contains(victim, w);
        Assert.Contains("other race 1 again", w);
        Assert.Equal(expected, BatchRunner.ResultsCsv(rows));
    }

    /// <summary>A stream that takes the first writes and then fails as a full disk does (ENOSPC).</summary>
    sealed class FullDisk(int okFiles)
    {
        int _opened;
        public Stream Open(string tmp)
        {
            var fs = new FileStream(tmp, FileMode.Create);
            return Interlocked.Increment(ref _opened) > okFiles ? new Failing(fs) : fs;
        }

        sealed class Failing(FileStream inner) : Stream
        {
            public override void Write(byte[] buffer, int offset, int count)
            {
                inner.Write(buffer, offset, Math.Min(count, 7)); // part of it lands, then the disk is full
                throw new IOException("No space left on device", 28);
            }
            public override void Write(ReadOnlySpan<byte> buffer) => Write(buffer.ToArray(), 0, buffer.Length);
            public override void Flush() => inner.Flush();
            protected override void Dispose(bool disposing) { if (disposing) inner.Dispose(); base.Dispose(disposing); }
            public override bool CanRead => false;
            public override bool CanSeek => false;
            public override bool CanWrite => true;
            public override long Length => inner.Length;
            public override long Position { get => inner.Position; set => throw new NotSupportedException(); }
            public override int Read(byte[] buffer, int offset, int count) => throw new NotSupportedException();
            public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
            public override void SetLength(long value) => throw new NotSupportedException();
        }
    }

    [Fact]
    public void AFullDiskStopsWithAPlainMessageLeavesNoTemporaryFileAndResumes()
    {
        var spec = ExperimentFile.Load(Fresh.Value.Exp, null, 3);
        string dir = Directory.CreateTempSubdirectory("cs-rf-").FullName, expected = Fresh.Value.Csv;
        // The manifest and two races (two files each) fit; the next write finds the disk full.
        var disk = new FullDisk(5);
        var e = Assert.Throws<IOException>(() => BatchRunner.Run(spec, dir, 1, false, open: disk.Open));
        Assert.Contains("the disk is full", e.Message);
        Assert.Contains("--resume", e.Message);
        Assert.Empty(Directory.GetFiles(dir, "*.tmp", SearchOption.AllDirectories));
        var rows = BatchRunner.Run(spec, dir, 2, true);
        Assert.Equal(expected, BatchRunner.ResultsCsv(rows));
    }

    [Fact]
    public void ASealedFileReadsBackOnlyWhenIntact()
    {
        string f = Path.Combine(Directory.CreateTempSubdirectory("cs-seal-").FullName, "x.csv");
        DurableFile.WriteText(f, DurableFile.Seal("a,b\n1,2\n"));
        Assert.True(DurableFile.TryReadSealed(f, out var body, out _));
        Assert.Equal("a,b\n1,2\n", body);
        File.WriteAllText(f, File.ReadAllText(f).Replace("1,2", "1,3"));
        Assert.False(DurableFile.TryReadSealed(f, out _, out var why));
        Assert.Contains("checksum", why);
        Assert.False(File.Exists(f + ".tmp"));
    }
}
