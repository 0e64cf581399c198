using CourseSim.Courses;
using CourseSim.Rules;

namespace CourseSim.Tests.Rules;

/// <summary>
/// Cases built from the definitions and rules 10-13 of the Racing Rules of Sailing 2025-2028 (World Sailing):
/// wind from the north throughout; boards 2.4 m long.
/// </summary>
public class RightOfWayTests
{
    const double Wind = 0, L = 2.4;

    [Fact]
    public void TheTackIsTheSideTheWindComesOver()
    {
        Assert.Equal(Tack.Starboard, RightOfWay.TackOf(315, Wind)); // heading north-west, wind over the starboard side
        Assert.Equal(Tack.Port, RightOfWay.TackOf(45, Wind));
        Assert.Equal(Tack.Starboard, RightOfWay.TackOf(225, Wind)); // running on starboard: wind over the starboard quarter
        Assert.Equal(Tack.Port, RightOfWay.TackOf(135, Wind));
    }

    [Fact]
    public void PortKeepsClearOfStarboard_Rule10()
    {
        var port = new RuleBoard(-20, 0, 45, L);
        var starboard = new RuleBoard(20, 0, 315, L);
        Assert.Equal(new Verdict(0, RuleNumber.Rule10), RightOfWay.Decide(port, starboard, Wind));
        Assert.Equal(new Verdict(1, RuleNumber.Rule10), RightOfWay.Decide(starboard, port, Wind));
    }

    [Fact]
    public void OverlappedOnTheSameTackTheWindwardBoardKeepsClear_Rule11()
    {
        // Both on starboard heading 315 (north-west); windward side is to the north-east of them.
        var leeward = new RuleBoard(0, 0, 315, L);
        var windward = new RuleBoard(2, 2, 315, L); // abeam, up to windward
        Assert.True(RightOfWay.Overlapped(leeward, windward));
        Assert.True(RightOfWay.Windward(windward, leeward, Wind));
        Assert.Equal(new Verdict(1, RuleNumber.Rule11), RightOfWay.Decide(leeward, windward, Wind));
    }

    [Fact]
    public void ClearAsternKeepsClearOfClearAhead_Rule12()
    {
        var ahead = new RuleBoard(0, 10, 0.0 + 315, L);
        var fwd = Vec2.FromBearing(315);
        var p = new Vec2(0, 10) - 5 * fwd; // 5 m directly behind: clear astern (hull 2.4 m)
        var astern = new RuleBoard(p.X, p.Y, 315, L);
        Assert.True(RightOfWay.ClearAstern(astern, ahead));
        Assert.False(RightOfWay.Overlapped(astern, ahead));
        Assert.Equal(new Verdict(0, RuleNumber.Rule12), RightOfWay.Decide(astern, ahead, Wind));
    }

    [Fact]
    public void OverlapBeginsWhenTheBowCrossesTheLineAbeamOfTheStern()
    {
        var ahead = new RuleBoard(0, 0, 0, L); // heading north; stern at y = -1.2
        var justBehind = new RuleBoard(3, -1.2 - 1.2 - 0.01, 0, L); // bow 1 cm behind the line abeam of the stern
        var justOver = new RuleBoard(3, -1.2 - 1.2 + 0.01, 0, L);
        Assert.True(RightOfWay.ClearAstern(justBehind, ahead));
        Assert.False(RightOfWay.ClearAstern(justOver, ahead));
        Assert.True(RightOfWay.Overlapped(justOver, ahead));
    }

    [Fact]
    public void ABoardTackingKeepsClear_Rule13()
    {
        var tacking = new RuleBoard(0, 0, 10, L, Tacking: true);
        var starboard = new RuleBoard(10, 5, 315, L);
        Assert.Equal(new Verdict(0, RuleNumber.Rule13), RightOfWay.Decide(tacking, starboard, Wind));
        // Even a board that was on starboard gives up its right of way while it tacks.
        var port = new RuleBoard(10, 5, 45, L);
        Assert.Equal(new Verdict(0, RuleNumber.Rule13), RightOfWay.Decide(tacking, port, Wind));
    }

    [Fact]
    public void TheZoneIsThreeHullLengths()
    {
        var mark = new Vec2(0, 0);
        Assert.True(RightOfWay.InZone(new RuleBoard(0, 3 * L + 1.0, 180, L), mark, L)); // bow 0.2 m inside
        Assert.False(RightOfWay.InZone(new RuleBoard(0, 3 * L + 1.4, 180, L), mark, L)); // bow 0.2 m outside
    }

    [Fact]
    public void ContactIsHullsCloserThanTheClearance()
    {
        var a = new RuleBoard(0, 0, 0, L);          // heading north, hull from y -1.2 to 1.2
        var crossing = new RuleBoard(0, 0.5, 90, L); // across its bow
        Assert.Equal(0, RightOfWay.HullDistance(a, crossing), 12);
        Assert.True(RightOfWay.Contact(a, crossing));
        var abeam = new RuleBoard(3, 0, 0, L);       // 3 m to starboard, parallel
        Assert.Equal(3, RightOfWay.HullDistance(a, abeam), 12);
        Assert.False(RightOfWay.Contact(a, abeam));
        var astern = new RuleBoard(0, -3.0, 0, L);   // bow 0.6 m behind a's stern
        Assert.Equal(0.6, RightOfWay.HullDistance(a, astern), 9);
        Assert.True(RightOfWay.Contact(a, astern));
    }
}
