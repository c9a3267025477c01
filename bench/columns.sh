# Columns shared by the bench scripts (sourced, not run).

# smallest bulk ESS (name and value) and largest R-hat of a summary file, skipping NaN rows
# (quantities that are constant over the draws)
extremes() {
  awk -F, 'NR == 1 { for (i = 1; i <= NF; i++) col[$i] = i; next }
    { e = $col["ess_bulk"]; r = $col["rhat"];
      if (e != "NaN" && e != "" && (min == "" || e + 0 < min)) { min = e + 0; name = $1 }
      if (r != "NaN" && r != "" && (max == "" || r + 0 > max)) max = r + 0 }
    END { printf "%.0f (`%s`) | %.3f", min, name, max }' "$1"
}

# the sampler's seconds recorded in a fit's run.json
sampler_seconds() {
  grep -o '"seconds": *[0-9.]*' "$1" | head -n 1 | awk -F: '{ printf "%.1f", $2 }'
}

# the console's verdict lines of a fit (parameters, then derived quantities), in short words
verdicts() {
  grep -E '^(All [0-9]+ parameters converged|Converged within chance|Not converged|Derived quantities:)' "$1" \
    | sed -E 's/^Derived quantities: //; s/^All [0-9]+ (parameters|derived quantities) converged.*/converged/; s/^Converged within chance.*/within chance/; s/^Not converged.*/not converged/' \
    | paste -sd '/' - | sed 's#/# / #'
}
