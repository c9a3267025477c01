package org.rungs.posteriors.report;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** Row indices of a long table (one row per group and rating) by group, in order of first appearance. */
final class GroupRows {
    private GroupRows() {
    }

    static Map<String, List<Integer>> of(CsvTable table) {
        Map<String, List<Integer>> rows = new LinkedHashMap<>();
        for (int r = 0; r < table.size(); r++) {
            rows.computeIfAbsent(table.text(r, "group"), g -> new ArrayList<>()).add(r);
        }
        return rows;
    }
}
