namespace Partwise.Core.Screening;

/// <summary>How a baseline estimates the location and scatter of its reference coordinates.</summary>
public enum ScatterMethod
{
    /// <summary>The mean and the sample covariance with divisor n − 1; see <see cref="ClassicalScatter"/>.</summary>
    Classical,

    /// <summary>
    /// The reweighted minimum covariance determinant by FAST-MCD (Rousseeuw &amp; Van Driessen 1999); see
    /// <see cref="RobustScatter"/>.
    /// </summary>
    Robust,
}
