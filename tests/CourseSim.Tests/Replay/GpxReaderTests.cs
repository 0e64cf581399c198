using CourseSim.Replay;
using CourseSim.Settings;

namespace CourseSim.Tests.Replay;

/// <summary>The GPX reader on hand-written files following the Topografix GPX 1.0 and 1.1 schemas.</summary>
public class GpxReaderTests
{
    // GPX 1.1 (http://www.topografix.com/GPX/1/1/gpx.xsd): two tracks, the first with two segments; extensions in the
    // namespace of a watch maker (invented here), elevation, a point without time.
    const string Gpx11 = """
        <?xml version="1.0" encoding="UTF-8"?>
        <gpx version="1.1" creator="hand" xmlns="http://www.topografix.com/GPX/1/1"
             xmlns:ext="http://example.invalid/ext/1">
          <metadata><name>session</name><time>2026-06-14T12:00:00Z</time></metadata>
          <wpt lat="1" lon="2"><name>beach</name></wpt>
          <trk>
            <name>morning</name>
            <extensions><ext:colour>red</ext:colour></extensions>
            <trkseg>
              <trkpt lat="43.5000000" lon="-8.2000000"><ele>0.5</ele><time>2026-06-14T12:00:00Z</time>
                <extensions><ext:hr>141</ext:hr><ext:speed>7.1</ext:speed></extensions></trkpt>
              <trkpt lat="43.5000100" lon="-8.2000100"><time>2026-06-14T12:00:01.5Z</time></trkpt>
              <trkpt lat="43.5000200" lon="-8.2000200"/>
            </trkseg>
            <trkseg>
              <trkpt lat="43.5001" lon="-8.2001"><time>2026-06-14T14:00:01+02:00</time></trkpt>
            </trkseg>
          </trk>
          <trk><trkseg><trkpt lat="43.6" lon="-8.3"><time>2026-06-14T13:00:00Z</time></trkpt></trkseg></trk>
        </gpx>
        """;

    // GPX 1.0 (http://www.topografix.com/GPX/1/0/gpx.xsd): time and speed are direct children of trkpt.
    const string Gpx10 = """
        <?xml version="1.0"?>
        <gpx version="1.0" creator="hand" xmlns="http://www.topografix.com/GPX/1/0">
          <time>2026-06-14T12:00:00Z</time>
          <trk><name>one</name><number>1</number>
            <trkseg>
              <trkpt lat="10.0" lon="20.0"><ele>1</ele><time>2026-06-14T12:00:00Z</time><course>45</course><speed>5.5</speed></trkpt>
              <trkpt lat="10.00001" lon="20.00001"><time>2026-06-14T12:00:01Z</time><speed>5.6</speed></trkpt>
            </trkseg>
          </trk>
        </gpx>
        """;

    [Fact]
    public void Gpx11TracksSegmentsExtensionsAndMissingTimes()
    {
        var segs = GpxReader.Parse(Gpx11, "a.gpx");
        Assert.Equal(3, segs.Count);
        Assert.Equal("morning", segs[0].Track);
        Assert.Equal(3, segs[0].Points.Count);
        Assert.Equal(43.5, segs[0].Points[0].Lat, 12);
        Assert.Equal(-8.2, segs[0].Points[0].Lon, 12);
        Assert.Equal(new DateTimeOffset(2026, 6, 14, 12, 0, 1, 500, TimeSpan.Zero), segs[0].Points[1].Time);
        Assert.Null(segs[0].Points[2].Time);
        Assert.Equal(new DateTimeOffset(2026, 6, 14, 12, 0, 1, TimeSpan.Zero), segs[1].Points[0].Time); // +02:00 taken to UTC
        Assert.Equal("track 2", segs[2].Track);
        Assert.Equal(43.6, segs[2].Points[0].Lat, 12);
    }

    [Fact]
    public void Gpx10TimesAndSpeeds()
    {
        var segs = GpxReader.Parse(Gpx10, "b.gpx");
        Assert.Single(segs);
        Assert.Equal(2, segs[0].Points.Count);
        Assert.Equal("one", segs[0].Track);
        Assert.Equal(new DateTimeOffset(2026, 6, 14, 12, 0, 1, TimeSpan.Zero), segs[0].Points[1].Time);
    }

    [Fact]
    public void APrefixedRootAndNoNamespaceAreRead()
    {
        var a = GpxReader.Parse("<g:gpx version=\"1.1\" xmlns:g=\"http://www.topografix.com/GPX/1/1\"><g:trk><g:trkseg><g:trkpt lat=\"1\" lon=\"2\"><g:time>2026-06-14T12:00:00Z</g:time></g:trkpt></g:trkseg></g:trk></g:gpx>", "p.gpx");
        Assert.Equal(2, a[0].Points[0].Lon, 12);
        Assert.NotNull(a[0].Points[0].Time);
        var b = GpxReader.Parse("<gpx version=\"1.1\"><trk><trkseg><trkpt lat=\"1\" lon=\"2\"/></trkseg></trk></gpx>", "n.gpx");
        Assert.Single(b[0].Points);
    }

    [Theory]
    [InlineData("<gpx xmlns=\"http://www.topografix.com/GPX/1/1\">\n<trk><trkseg>\n<trkpt lat=\"1\" lon=\"2\"></trkseg></trk></gpx>", 3)]
    [InlineData("<gpx xmlns=\"http://www.topografix.com/GPX/1/1\">\n<trk><trkseg>\n\n<trkpt lat=\"91\" lon=\"2\"/></trkseg></trk></gpx>", 4)]
    [InlineData("<gpx xmlns=\"http://www.topografix.com/GPX/1/1\"><trk><trkseg>\n<trkpt lat=\"1\" lon=\"2\">\n<time>noon</time></trkpt></trkseg></trk></gpx>", 3)]
    [InlineData("<kml>\n</kml>", 1)]
    public void MalformedFilesAreLocatedErrors(string text, int line)
    {
        var e = Assert.Throws<SettingsException>(() => GpxReader.Parse(text, "bad.gpx"));
        Assert.Equal(line, e.Line);
        Assert.StartsWith($"bad.gpx:{line}:", e.Message);
    }
}
