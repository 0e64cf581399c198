using CourseSim.Units;
using CourseSim.Wind;

namespace CourseSim.Engine.Systems;

/// <summary>
/// Sense wind: the wind field at each rig with the shadows of the other sails, and the rider's reading of it, which lags
/// the true wind by <see cref="Tuning.PerceptionLagS"/>. Each board samples at race.wind_hz (default 5 Hz) in its own
/// phase of the cycle (from its identity key, so every step costs about the same): in 0.2 s a board moves a few metres
/// and the field's patterns a metre or two, less than the gust tile resolves, so sampling faster changes nothing but the
/// cost. The shadows are rebuilt at the start of each cycle from the last step snapshot, in the canonical board order.
/// </summary>
public sealed class SenseWindSystem : RaceSystem
{
    public override string Name => "sense wind";
    public override SystemScope Scope => SystemScope.OwnBoard;
    public override string Reads => "Pose; snapshot (wakes); wind field";
    public override string Writes => "SensedWind";

    public override void Prepare(RaceContext c)
    {
        if (c.SensePhase != 0) return;
        var s = c.Snapshot; var f = c.Fleet; var src = c.ShadowSources;
        for (int r = 0; r < f.Count; r++)
        {
            int b = f.ByRank[r];
            // A finished board sails off the course and leaves no wake.
            double wind = s.Finished[b] ? 0 : s.Tws[b];
            src[r] = new ShadowSource(s.X[b], s.Y[b], s.AppFromDeg[b], f.MastHeightM[b], wind, s.AppDownX[b], s.AppDownY[b]);
        }
        c.Shadow.Build(src);
    }

    public override void RunBoards(RaceContext c, ref BoardBlock blk)
    {
        bool first = c.StepIndex == 0;
        int phase = c.SensePhase;
        double k = Math.Min(1, c.SenseEvery * c.Dt / Tuning.PerceptionLagS);
        var f = c.Fleet;
        // The gust tiles are megabytes read at scattered cells: ask for every due board's cells first, so their cache
        // misses overlap instead of each sample waiting for its own (a hint: no value changes).
        for (int i = 0; i < blk.Count; i++)
            if (first || f.SenseSlot[blk.Id[i].Value] == phase) c.Wind.Prefetch(blk.Pose[i].X, blk.Pose[i].Y, c.Time);
        for (int i = 0; i < blk.Count; i++)
        {
            int b = blk.Id[i].Value;
            if (!first && f.SenseSlot[b] != phase) continue;
            ref readonly var pose = ref blk.Pose[i];
            ref var sw = ref blk.Wind[i];
            var w = c.Wind.Sample(pose.X, pose.Y, c.Time);
            w = c.Shadow.Apply(w, pose.X, pose.Y, f.Rank[b]);
            sw.TrueSpeed = w.SpeedMs; sw.TrueFromDeg = w.FromDeg;
            sw.FromRad = Unit.DegToRad(w.FromDeg); (sw.FromSin, sw.FromCos) = FastMath.SinCos(sw.FromRad);
            sw.RigSpeed = w.SpeedMs * f.Rigs[b].GradientFactor(w.SpeedMs);
            if (first) { sw.PerceivedSpeed = w.SpeedMs; sw.PerceivedFromDeg = w.FromDeg; }
            else
            {
                sw.PerceivedSpeed += k * (w.SpeedMs - sw.PerceivedSpeed);
                sw.PerceivedFromDeg = Unit.WrapDeg360(sw.PerceivedFromDeg + k * Unit.WrapDeg180(w.FromDeg - sw.PerceivedFromDeg));
            }
        }
    }
}
