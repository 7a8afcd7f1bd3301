"""A client for the Partwise HTTP service (compositional data: log-ratio coordinates, ratio selection, screening).

    >>> from partwise_client import Client
    >>> pw = Client("http://127.0.0.1:5080")
    >>> clr = pw.coordinates(frame, transform="clr", zeros={"method": "multiplicative", "detectionLimits": 0.05})

Tables go in as pandas DataFrames, lists of dicts or lists of lists (see partwise_client.tables) and come back as
DataFrames with the sample ids as index. Error answers raise PartwiseError with the problem document.
Screening flags are statistical signals for a qualified analyst, not decisions.
"""
from .client import DEFAULT_URL, Client, FlagPage, ratio
from .errors import PartwiseError
from .retry import RetryPolicy
from .tables import from_table, log_moments, to_samples, to_table

__all__ = ["Client", "DEFAULT_URL", "FlagPage", "PartwiseError", "RetryPolicy", "from_table", "log_moments",
           "ratio", "to_samples", "to_table"]
__version__ = "0.1.0"
