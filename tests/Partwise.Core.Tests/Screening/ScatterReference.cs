using System.Text.Json;
using Partwise.Core.Tests.Support;

namespace Partwise.Core.Tests.Screening;

/// <summary>scikit-learn's MinCovDet (Debian python3-sklearn) on a coordinate matrix, with its intermediate pieces.</summary>
internal static class ScatterReference
{
    // Common part: our conventions computed by scipy from sklearn's pieces. sklearn's reweighted covariance has
    // divisor Σw and no consistency factor; ours has divisor Σw − 1 and c₁ = 0.975 / F_χ²(p+2)(χ²_p(0.975)).
    private const string Prelude =
        """
        import json, sys
        import numpy as np
        from scipy.stats import chi2
        from sklearn.covariance import MinCovDet
        from sklearn.covariance._robust_covariance import c_step
        d = json.load(sys.stdin)
        X = np.array(d['x'], dtype=float)
        n, p = X.shape
        q = chi2.ppf(0.975, p)
        c1 = 0.975 / chi2.cdf(q, p + 2)
        def d2(loc, cov):
            c = X - loc
            return np.einsum('ij,jk,ik->i', c, np.linalg.inv(cov), c)
        def ours(m):
            w = m.support_.sum()
            return m.covariance_ * w / (w - 1) * c1
        def logdet(rows):
            return float(np.linalg.slogdet(np.cov(X[rows].T, bias=True))[1])
        """;

    // sklearn's own search from its fixed random_state.
    private const string FitScript =
        Prelude +
        """

        m = MinCovDet(random_state=0).fit(X)
        cov = ours(m)
        print(json.dumps({
            'rawSupport': [int(i) for i in np.flatnonzero(m.raw_support_)],
            'rawLogDet': logdet(m.raw_support_),
            'location': m.location_.tolist(),
            'covariance': cov.ravel().tolist(),
            'flagged': [int(i) for i in np.flatnonzero(d2(m.location_, cov) > q)],
            'flaggedAsSklearn': [int(i) for i in np.flatnonzero(m.mahalanobis(X) > q)],
        }))
        """;

    // sklearn's C-step started from our raw estimate, then sklearn's own correct_covariance and reweight_covariance,
    // the steps MinCovDet.fit runs after its search.
    private const string FromRawScript =
        Prelude +
        """

        h = d['h']
        loc, cov, det, support, dist = c_step(X, h, initial_estimates=(np.array(d['location']), np.array(d['covariance']).reshape(p, p)), random_state=0)
        m = MinCovDet(random_state=0)
        m.raw_location_, m.raw_covariance_, m.raw_support_ = loc, cov, support
        m.location_, m.support_, m.dist_ = loc, support, dist
        correction = float(np.median(dist) / chi2(p).isf(0.5))
        m.correct_covariance(X)
        m.reweight_covariance(X)
        print(json.dumps({
            'rawSupport': [int(i) for i in np.flatnonzero(support)],
            'rawLocation': loc.tolist(),
            'rawCovariance': (cov * correction).ravel().tolist(),
            'correction': correction,
            'support': [int(i) for i in np.flatnonzero(m.support_)],
            'location': m.location_.tolist(),
            'covariance': ours(m).ravel().tolist(),
            'c1': float(c1),
            'flagged': [int(i) for i in np.flatnonzero(d2(m.location_, ours(m)) > q)],
        }))
        """;

    /// <summary>MinCovDet(random_state=0).fit: its raw subset, log-determinant, final estimate in our conventions, and flags.</summary>
    public static JsonElement MinCovDet(double[] coordinates, int p) =>
        PythonReference.Run(FitScript, new { x = CoordinateMaps.Rows(coordinates, p) });

    /// <summary>sklearn's C-step from the given raw estimate, then sklearn's consistency correction and reweighting.</summary>
    public static JsonElement FromRaw(double[] coordinates, int p, int h, IReadOnlyList<double> location, IReadOnlyList<double> covariance) =>
        PythonReference.Run(FromRawScript, new { x = CoordinateMaps.Rows(coordinates, p), h, location, covariance });

    public static int[] Ints(this JsonElement e) => [.. e.EnumerateArray().Select(x => x.GetInt32())];

    public static double[] Doubles(this JsonElement e) => [.. e.EnumerateArray().Select(x => x.GetDouble())];
}
