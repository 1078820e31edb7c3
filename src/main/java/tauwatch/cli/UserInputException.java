package tauwatch.cli;

/** Input the user gave that cannot be used; the message is one line naming what is wrong. */
final class UserInputException extends Exception {
  private static final long serialVersionUID = 1L;

  UserInputException(String message) {
    super(message);
  }

  UserInputException(String message, Throwable cause) {
    super(message, cause);
  }
}
