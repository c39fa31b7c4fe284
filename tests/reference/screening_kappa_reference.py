"""Cohen's kappa of two screeners from their paired categories, by statsmodels (stdin: {"pairs": [[a, b], ...]})."""
import json
import sys

import numpy as np
from statsmodels.stats.inter_rater import cohens_kappa, to_table

pairs = json.load(sys.stdin)["pairs"]
cats = sorted({c for p in pairs for c in p})
codes = np.array([[cats.index(a), cats.index(b)] for a, b in pairs])
table, _ = to_table(codes, bins=np.arange(len(cats) + 1) - 0.5)
res = cohens_kappa(table)
agree = float(np.trace(table) / table.sum())
print(json.dumps({"kappa": float(res.kappa), "se": float(res.std_kappa), "percentAgreement": agree}))
