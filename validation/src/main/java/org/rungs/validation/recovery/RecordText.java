package org.rungs.validation.recovery;

import java.lang.reflect.InvocationTargetException;
import java.lang.reflect.RecordComponent;
import java.util.Arrays;
import java.util.Collection;
import java.util.stream.Collectors;
import java.util.stream.IntStream;

/**
 * The full content of a value as one line of text: records by their components, arrays and lists
 * by their elements (a record's own {@code toString} prints an array by its identity), so that two
 * equal scenarios or model specs give equal text and a study folder can be recognised on a rerun.
 */
final class RecordText {
    private RecordText() {
    }

    static String of(Object value) {
        if (value == null) {
            return "null";
        }
        if (value instanceof double[] a) {
            return Arrays.toString(a);
        }
        if (value instanceof int[] a) {
            return Arrays.toString(a);
        }
        if (value instanceof Object[] a) {
            return Arrays.stream(a).map(RecordText::of).collect(Collectors.joining(", ", "[", "]"));
        }
        if (value instanceof Collection<?> c) {
            return c.stream().map(RecordText::of).collect(Collectors.joining(", ", "[", "]"));
        }
        Class<?> type = value.getClass();
        if (!type.isRecord()) {
            return value.toString();
        }
        RecordComponent[] components = type.getRecordComponents();
        return IntStream.range(0, components.length)
                .mapToObj(i -> components[i].getName() + "=" + of(read(components[i], value)))
                .collect(Collectors.joining(", ", type.getSimpleName() + "[", "]"));
    }

    private static Object read(RecordComponent component, Object value) {
        try {
            var accessor = component.getAccessor();
            accessor.trySetAccessible();
            return accessor.invoke(value);
        } catch (IllegalAccessException | InvocationTargetException e) {
            throw new IllegalStateException("cannot read " + component.getName() + " of " + value.getClass().getName(), e);
        }
    }
}
