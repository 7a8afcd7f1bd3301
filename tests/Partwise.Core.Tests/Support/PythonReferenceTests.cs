namespace Partwise.Core.Tests.Support;

public class PythonReferenceTests
{
    [NeedsPythonFact]
    public void ReferencePythonRoundTripsJsonThroughNumpy()
    {
        // numpy's own sum of 1..4, as a check that the harness passes JSON both ways.
        var result = PythonReference.Run("import json,sys,numpy as np; d=json.load(sys.stdin); print(json.dumps({'s': float(np.sum(d['x']))}))", new { x = new[] { 1.0, 2.0, 3.0, 4.0 } });
        Assert.Equal(10.0, result.GetProperty("s").GetDouble());
    }
}
