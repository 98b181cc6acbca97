package trapmap.maps.batch;

/**
 * A batch was not started because its output folder does not allow it: another run holds the folder, the folder
 * holds another run's results, or a resumed run's settings differ from the recorded ones. Nothing was written.
 */
public final class RunRefusedException extends RuntimeException {
    public RunRefusedException(String message) {
        super(message);
    }
}
