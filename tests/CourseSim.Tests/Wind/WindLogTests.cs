using CourseSim.Settings;
using CourseSim.Wind;

namespace CourseSim.Tests.Wind;

/// <summary>The wind log reader on hand-written station logs (docs/wind-fit.md, "Formats").</summary>
public class WindLogTests
{
    [Fact]
    public void IsoTimesKnotsAndGustsAreReadWithTheirUnits()
    {
        string csv = "# Fictional station, hand-written sample\ntime,speed_kn,direction_deg,gust_kn\n" +
            string.Join("\n", Enumerable.Range(0, 12).Select(i => $"2026-06-14T13:{i:00}:00Z,{10 + i % 3},{220 + i},{14 + i % 3}"));
        var log = WindLog.Parse(csv, "a.csv", new WindLogFormat());
        Assert.Equal(12, log.Count);
        Assert.Equal(660, log.DurationS, 9);
        Assert.Equal(10 * 1852.0 / 3600, log.SpeedMs[0], 12);   // 1 kn = 1852 m/h (BIPM SI brochure, table 8)
        Assert.Equal(14 * 1852.0 / 3600, log.GustMs[0], 12);
        Assert.Equal(60, log.MedianStepS, 9);
        Assert.Empty(log.Problems);
        Assert.Contains("speed=speed_kn (kn)", log.Mapping);
    }

    [Fact]
    public void EpochSecondsSemicolonsAndMetresPerSecondFromTheHeader()
    {
        string csv = "epoch;wind_speed (m/s);wd\n" + string.Join("\n", Enumerable.Range(0, 15).Select(i => $"{1781442000 + 2 * i};{5.0 + 0.1 * i};{180}"));
        var log = WindLog.Parse(csv, "b.csv", new WindLogFormat());
        Assert.Equal(15, log.Count);
        Assert.Equal(5.0, log.SpeedMs[0], 12);
        Assert.Equal(2, log.MedianStepS, 9);
        Assert.False(log.HasGust);
        Assert.Equal(DateTimeOffset.FromUnixTimeSeconds(1781442000), log.Start);
    }

    [Fact]
    public void EpochMillisecondsAndNamedColumnsWithAUnit()
    {
        string csv = "Zeit,V,R\n" + string.Join("\n", Enumerable.Range(0, 11).Select(i => $"{1781442000000L + 1000 * i},{36 + i},{90}"));
        var log = WindLog.Parse(csv, "c.csv", WindLogFormat.Parse("time=Zeit,speed=V,dir=R,unit=km/h", "--columns"));
        Assert.Equal(10, log.DurationS, 9);
        Assert.Equal(10.0, log.SpeedMs[0], 12);
    }

    [Fact]
    public void BadRowsGapsCallsAndIrregularSamplingAreReportedNotFatal()
    {
        var rows = new List<string> { "time,speed,dir,gust" };
        for (int i = 0; i < 20; i++) rows.Add($"2026-06-14T13:00:{i * 2 + (i > 10 ? 1 : 0):00}Z,{(i == 5 ? 0 : 12)},{(i == 5 ? 0 : 200)},15");
        rows.Insert(4, "2026-06-14T13:00:05Z,twelve,200,15");     // line 5 (index 4; the header is line 1): not a number
        rows.Insert(7, "2026-06-14T13:00:01Z,12,200,15");         // line 8: back in time
        rows.Insert(9, "2026-06-14T13:00:09Z,,200,");             // line 10: a gap
        rows.Insert(10, "2026-06-14T13:00:09.5Z,12,400,15");      // line 11: direction out of range
        rows.Add("tomorrow,12,200,15");                          // line 26
        var log = WindLog.Parse(string.Join("\n", rows), "d.csv", new WindLogFormat());
        Assert.Equal(20, log.Count);
        Assert.Equal(new[] { 5, 8, 10, 11, 26 }, log.Problems.Select(p => p.Line).ToArray());
        Assert.Contains("twelve", log.Problems[0].Problem);
        Assert.True(double.IsNaN(log.DirDeg[5]));                  // a calm has no direction
        Assert.Equal(0, log.SpeedMs[5]);
    }

    [Fact]
    public void AMissingColumnOrTooFewRowsIsALocatedError()
    {
        var e = Assert.Throws<SettingsException>(() => WindLog.Parse("time,speed\n1,2\n", "e.csv", new WindLogFormat()));
        Assert.Equal(1, e.Line);
        Assert.Contains("dir", e.Message);
        var e2 = Assert.Throws<SettingsException>(() => WindLog.Parse("time,speed,dir\n1,2,3\n2,x,3\n", "f.csv", new WindLogFormat()));
        Assert.Contains("line 3", e2.Message);
    }
}
