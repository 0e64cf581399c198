using CourseSim.Engine;
using CourseSim.Units;

namespace CourseSim.Rules;

/// <summary>
/// Serving a one-turn penalty (the rider's part; the judge awards it in ContactSystem) (RRS 44.1 as changed by Appendix B), as soon as the board is racing and well clear of
/// others: one full turn made of a tack and a gybe, the same way round: head up to close-hauled, tack, bear away, gybe
/// back onto the original tack. The tack and the gybe each wait until the rider is well clear; waiting, a rider with a
/// board ahead or level sheets out to let it go.
/// </summary>
public static class PenaltyTurn
{
    /// <summary>A rider is well clear to take a penalty with no other board this close, m (model value).</summary>
    public const double WellClearM = 15;
    /// <summary>
    /// A rider who has waited this long (s) half-way through a penalty turn for clear water gives the turn up and races
    /// on, to begin it again when well clear (model value; the penalty is still owed). Held on the turn's heading, riders
    /// ran on downwind in company for minutes, away from the mark they had to round, sheeting out on a run hardly
    /// separating them (40 boards, seed 43: 175 s, the first leg 803 s).
    /// </summary>
    public const double GiveUpWaitS = 30;

    /// <summary>Starts a penalty turn for a board that owes one, is racing, free, and well clear of the others.</summary>
    public static void MaybeStart(RaceContext c, int b, ref Penalty pen, in Pose pose, in SensedWind sw, in ManoeuvreState man, in RaceStatus st)
    {
        if (pen.Owed <= 0 || pen.Stage != 0 || man.Kind != Manoeuvre.None) return;
        if (st.State is not (RaceState.Racing or RaceState.Returning) || c.Grid.NearestM[b] < WellClearM) return;
        pen.Sign = Sailing.SignedAngle(sw.TrueFromDeg, pose.Heading) >= 0 ? 1 : -1;
        pen.Stage = 1;
    }

    public static void Steer(RaceContext c, int b, ref Penalty pen, ref Perception per, in Pose pose, in SensedWind sw, in ManoeuvreState man, ref double h, ref double pw)
    {
        double twa = Sailing.SignedAngle(sw.TrueFromDeg, pose.Heading);
        int s = pen.Sign;
        double fromDeg = sw.TrueFromDeg;
        double At(double twaDeg) => Unit.WrapRadPi(Unit.DegToRad(fromDeg - twaDeg));
        bool crowded = c.Grid.NearestM[b] < WellClearM && Crowded(c, b);
        if (crowded && pen.InWaitStage && man.Kind == Manoeuvre.None && c.Time - pen.WaitFromS > GiveUpWaitS)
        {
            // Given up for now: the tactic steers again this step and the turn begins anew when well clear.
            pen.Stage = 0;
            return;
        }
        pw = 1;
        switch (pen.Stage)
        {
            case 1:
                h = At(s * 45);
                if (Math.Abs(twa) < Unit.DegToRad(60)) { pen.Stage = 2; pen.WaitFromS = c.Time; }
                break;
            case 2:
                // Waiting to be well clear for the tack: still on the original tack, nothing begun.
                bool waitTack = crowded && man.Kind == Manoeuvre.None && FastMath.Sign(twa) == s;
                h = waitTack ? At(s * 45) : At(-s * 45);
                if (waitTack && DropsBack(c, b, pose)) pw = 0;
                if (man.Kind == Manoeuvre.None && FastMath.Sign(twa) == -s) pen.Stage = 3;
                break;
            case 3:
                h = At(-s * 150);
                if (Math.Abs(twa) > Unit.DegToRad(130)) { pen.Stage = 4; pen.WaitFromS = c.Time; }
                break;
            case 4:
                // Waiting to be well clear for the gybe: still on the other tack, nothing begun.
                bool waitGybe = crowded && man.Kind == Manoeuvre.None && FastMath.Sign(twa) == -s;
                h = waitGybe ? At(-s * 150) : At(s * 150);
                if (waitGybe && DropsBack(c, b, pose)) pw = 0;
                if (man.Kind == Manoeuvre.None && FastMath.Sign(twa) == s)
                {
                    pen.Stage = 0; pen.Owed--; pen.Taken++; per.LastTurnS = c.Time;
                    c.AddEvent(b, RaceEventKind.PenaltyServed, pose, "one-turn penalty taken");
                }
                break;
        }
    }

    /// <summary>
    /// Whether a board other than one that gives way to b's penalty is within <see cref="WellClearM"/>. A board that is
    /// itself waiting to take a penalty with b ahead of it (or level, b earlier in the canonical order) sheets out to
    /// let b go (<see cref="DropsBack"/>), so b need not wait for it: three boards owing penalties otherwise ran on
    /// downwind together for ten minutes, sheeting out on a run hardly slowing the ones behind (40 boards, seed 17).
    /// The turn itself is still vetted by the lookout (RRS 15, 16), which puts it off with a board too close.
    /// </summary>
    static bool Crowded(RaceContext c, int b)
    {
        var s = c.Snapshot;
        foreach (int j in c.Grid.Neighbours(b))
        {
            if (!WithinWellClear(s, b, j)) continue;
            if (!s.PenaltyWait[j] || !LetsGo(c, j, Math.SinCos(s.Heading[j]), b)) return true;
        }
        return false;
    }

    /// <summary>
    /// Waiting to be well clear for the tack or gybe of a penalty, a rider with a board within <see cref="WellClearM"/>
    /// that is ahead (or level, and earlier in the fleet's canonical order of ids, so that the file's order changes nothing) sheets out and lets it go: two boards that both owe a
    /// penalty otherwise sailed on side by side, each waiting for the other, far past the mark (issue 12; RRS 44.1 asks
    /// for the turn as soon as possible; model value: level means within a metre along the heading).
    /// </summary>
    static bool DropsBack(RaceContext c, int b, in Pose pose)
    {
        var s = c.Snapshot;
        var dir = Math.SinCos(pose.Heading);
        foreach (int j in c.Grid.Neighbours(b))
            if (WithinWellClear(s, b, j) && LetsGo(c, b, dir, j)) return true;
        return false;
    }

    static bool WithinWellClear(StepSnapshot s, int a, int j)
    {
        double dx = s.X[j] - s.X[a], dy = s.Y[j] - s.Y[a];
        return dx * dx + dy * dy < WellClearM * WellClearM;
    }

    /// <summary>Whether a rider waiting for clear water at <paramref name="waiter"/>, heading along <paramref name="dir"/>
    /// (sine, cosine of the heading), lets <paramref name="other"/> go: it is more than a metre ahead, or level and earlier
    /// in the canonical order.</summary>
    static bool LetsGo(RaceContext c, int waiter, (double Sin, double Cos) dir, int other)
    {
        var s = c.Snapshot;
        double ahead = (s.X[other] - s.X[waiter]) * dir.Sin + (s.Y[other] - s.Y[waiter]) * dir.Cos;
        return ahead > 1 || Math.Abs(ahead) <= 1 && c.Fleet.Rank[other] < c.Fleet.Rank[waiter];
    }
}
